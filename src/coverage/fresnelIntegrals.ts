/**
 * Fresnel integrals C(x) = ∫₀ˣ cos(πt²/2) dt and S(x) = ∫₀ˣ sin(πt²/2) dt, and the exact
 * single knife-edge diffraction loss built on them (ITU-R P.526-15 §4.1, eq. 30 form).
 *
 * Method (Abramowitz & Stegun 7.3 and 7.1; the continued fraction as in Numerical Recipes,
 * 3rd ed., §6.8): the power series below |x| = 1.5, and above it the continued fraction of the
 * complementary error function with C + iS = (1 + i)/2 · erf((√π/2)(1 − i)x). Both are summed to
 * double precision; tests compare with scipy.special.fresnel (tests/fixtures/propagation).
 */
import { linearToDb } from "./units.ts";

/** Below this |x| the power series is summed; above it the continued fraction (NR 3rd ed. §6.8 switch point). */
const SERIES_LIMIT = 1.5;
/** Relative size of the last term or step at which a sum has converged (about double-precision epsilon). */
const CONVERGED = 1e-16;
/** Hard cap on series terms or continued-fraction steps; both converge in well under 100 for finite x. */
const MAX_STEPS = 500;
/** Lentz's guard against a zero denominator (NR 3rd ed. §5.2). */
const TINY = 1e-300;

/** The two Fresnel integrals at one argument. */
export interface FresnelPair {
  /** C(x), dimensionless. */
  c: number;
  /** S(x), dimensionless. */
  s: number;
}

function fresnelSeries(x: number): FresnelPair {
  // C = x Σ (−1)^n t^(2n) / ((2n)! (4n+1)),  S = x Σ (−1)^n t^(2n+1) / ((2n+1)! (4n+3)),  t = πx²/2.
  const t = (Math.PI / 2) * x * x;
  let term = 1; // t^k / k!
  let c = 0;
  let s = 0;
  for (let k = 0; k < MAX_STEPS; k++) {
    const contribution = term / (2 * k + 1);
    const sign = k % 4 < 2 ? 1 : -1;
    if (k % 2 === 0) c += sign * contribution;
    else s += sign * contribution;
    if (contribution < CONVERGED * Math.max(Math.abs(c), Math.abs(s), TINY) && k > 1) break;
    term *= t / (k + 1);
  }
  return { c: x * c, s: x * s };
}

function fresnelContinuedFraction(x: number): FresnelPair {
  // erfc z = (2z/√π) e^(−z²) · 1/(b0 − 1·2/(b1 − 3·4/(b2 − …))),  b_j = 2z² + 1 + 4j,
  // and with z = (√π/2)(1 − i)x: 2z² = −iπx², 2z/√π = (1 − i)x, e^(−z²) = e^(iπx²/2).
  const pix2 = Math.PI * x * x;
  // Modified Lentz evaluation of g = b0 + a1/(b1 + a2/(b2 + …)), a_j = −(2j − 1)(2j); h = 1/g.
  let bRe = 1;
  const bIm = -pix2;
  let fRe = bRe;
  let fIm = bIm;
  let cRe = fRe;
  let cIm = fIm;
  let dRe = 0;
  let dIm = 0;
  for (let j = 1; j < MAX_STEPS; j++) {
    const a = -(2 * j - 1) * (2 * j);
    bRe += 4;
    // D = 1 / (b + a·D)
    let denRe = bRe + a * dRe;
    const denIm = bIm + a * dIm;
    if (denRe === 0 && denIm === 0) denRe = TINY;
    let mag = denRe * denRe + denIm * denIm;
    dRe = denRe / mag;
    dIm = -denIm / mag;
    // C = b + a / C
    mag = cRe * cRe + cIm * cIm;
    cRe = bRe + (a * cRe) / mag;
    cIm = bIm - (a * cIm) / mag;
    if (cRe === 0 && cIm === 0) cRe = TINY;
    // f *= C·D
    const delRe = cRe * dRe - cIm * dIm;
    const delIm = cRe * dIm + cIm * dRe;
    const nRe = fRe * delRe - fIm * delIm;
    fIm = fRe * delIm + fIm * delRe;
    fRe = nRe;
    if (Math.abs(delRe - 1) + Math.abs(delIm) < CONVERGED) break;
  }
  // h = 1 / f
  const fMag = fRe * fRe + fIm * fIm;
  const hRe = fRe / fMag;
  const hIm = -fIm / fMag;
  // erfc = (1 − i)·x · (cos θ + i sin θ) · h,  θ = πx²/2
  const theta = pix2 / 2;
  const cosT = Math.cos(theta);
  const sinT = Math.sin(theta);
  const pRe = x * (cosT + sinT); // (1 − i)(cos θ + i sin θ) = (cos θ + sin θ) + i(sin θ − cos θ)
  const pIm = x * (sinT - cosT);
  const eRe = pRe * hRe - pIm * hIm;
  const eIm = pRe * hIm + pIm * hRe;
  // C + iS = (1 + i)/2 · (1 − erfc)
  const oRe = 1 - eRe;
  const oIm = -eIm;
  return { c: 0.5 * (oRe - oIm), s: 0.5 * (oRe + oIm) };
}

/**
 * Fresnel integrals C(x) = ∫₀ˣ cos(πt²/2) dt and S(x) = ∫₀ˣ sin(πt²/2) dt.
 * @param x dimensionless argument, any real number (both integrals are odd in x).
 * @returns {c, s}, dimensionless; C(±∞) = S(±∞) = ±0.5; NaN in gives NaN out.
 * Accuracy: about 1e-15 absolute for |x| ≤ 100 against scipy.special.fresnel; for very large |x|
 * the phase πx²/2 loses precision in double arithmetic, but the oscillating part is bounded by 1/(π|x|).
 * Reference: Abramowitz & Stegun 7.3.1–7.3.2 (definitions), 7.3.11–7.3.12 (series); NR 3rd ed. §6.8.
 */
export function fresnelIntegrals(x: number): FresnelPair {
  if (Number.isNaN(x)) return { c: Number.NaN, s: Number.NaN };
  if (x === 0) return { c: 0, s: 0 };
  if (!Number.isFinite(x)) return x > 0 ? { c: 0.5, s: 0.5 } : { c: -0.5, s: -0.5 };
  const ax = Math.abs(x);
  const r = ax < SERIES_LIMIT ? fresnelSeries(ax) : fresnelContinuedFraction(ax);
  return x < 0 ? { c: -r.c, s: -r.s } : r;
}

/**
 * Exact single knife-edge diffraction loss: the field behind an ideal absorbing half-plane,
 * J(v) = −20·log10(√((1 − C(v) − S(v))² + (C(v) − S(v))²) / 2) dB.
 * @param v Fresnel–Kirchhoff diffraction parameter, dimensionless, any real: positive when the edge
 *   stands above the line of sight (see fresnelParameterV in propagation.ts).
 * @returns loss in dB relative to free space: 6.02 dB at v = 0, → +∞ as v → +∞, → 0 as v → −∞ and
 *   slightly negative (a gain of up to 1.37 dB near v = −1.22) in the lit-region ripples for v < 0; NaN for NaN.
 * Reference: ITU-R P.526-15 §4.1, eq. (30) (equation number from memory); Fresnel integrals as above.
 */
export function knifeEdgeLossExactDb(v: number): number {
  if (Number.isNaN(v)) return Number.NaN;
  if (v === Number.POSITIVE_INFINITY) return Number.POSITIVE_INFINITY;
  if (v === Number.NEGATIVE_INFINITY) return 0;
  const { c, s } = fresnelIntegrals(v);
  const a = 1 - c - s;
  const b = c - s;
  // Field ratio |E/E0| = √(a² + b²)/2, so the power ratio is (a² + b²)/4.
  return -linearToDb((a * a + b * b) / 4);
}
