/**
 * Detection theory for a square-law detector with N looks integrated non-coherently: the threshold
 * from the false-alarm probability, the exact probability of detection for Swerling cases 0–4, and
 * the inverse (required per-look SNR). Rules PD1–PD8 in docs/model-spec.md ("Detection").
 *
 * Conventions (Richards, "Fundamentals of Radar Signal Processing", 2nd ed., ch. 6):
 * each look is the squared magnitude of one coherently integrated sample, normalised to unit mean
 * noise power; the test statistic is the sum of the N looks; SNR is the per-look (single-look) SNR
 * after coherent integration, a linear power ratio, as the radar equation gives it.
 */
import gammaincinv from "@stdlib/math-base-special-gammaincinv";
import { gammaMixtureSf } from "./marcumQ.ts";
import { dbToLinear } from "./units.ts";

/**
 * Swerling target-fluctuation case: 0 steady (also called case 5), 1 and 3 scan-to-scan (RCS
 * constant over the N looks, chi-square with 2 and 4 degrees of freedom), 2 and 4 pulse-to-pulse
 * (independent per look, 2 and 4 degrees of freedom). Swerling, IRE Trans. IT-6, 1960.
 */
export type SwerlingCase = 0 | 1 | 2 | 3 | 4;

/** Lowest and highest per-look SNR searched by {@link requiredSnrDb}, dB. */
const SEARCH_LOW_DB = -60;
const SEARCH_HIGH_DB = 60;
const SEARCH_STEP_DB = 20;
const SEARCH_LIMIT_DB = 400;
/** Root tolerance of {@link requiredSnrDb}, dB. */
const ROOT_TOL_DB = 1e-9;
const MAX_ROOT_ITERATIONS = 200;

function isValidLooks(looks: number): boolean {
  return Number.isInteger(looks) && looks >= 1;
}

function isSwerlingCase(c: number): c is SwerlingCase {
  return c === 0 || c === 1 || c === 2 || c === 3 || c === 4;
}

/**
 * Detection threshold for N looks summed after a square-law detector, from the false-alarm probability.
 * Noise alone makes the sum gamma distributed with shape N, so Pfa = Q(N, T) and T = Q⁻¹(N, Pfa).
 *
 * Inputs: `pfa` in (0, 1), dimensionless; `looks` integer ≥ 1.
 * Output: threshold T in units of the per-look mean noise power (T = −ln Pfa for one look), > 0.
 * Edges: NaN, pfa ≤ 0 or ≥ 1, non-integer or < 1 looks give NaN.
 * References: Q(a, x) = Γ(a, x)/Γ(a), the regularised upper incomplete gamma (NIST DLMF eq. 8.2.4);
 * the sum of N independent unit-mean exponential (square-law noise) samples is gamma with shape N
 * (Johnson, Kotz & Balakrishnan, "Continuous Univariate Distributions", vol. 1, 2nd ed., 1994, ch. 17;
 * chapter from memory). In radar texts: Richards, FRSP 2nd ed., 2014, ch. 6, threshold for noncoherent
 * integration through the incomplete gamma function; DiFranco & Rubin, "Radar Detection", 1968, the
 * chapter on noncoherent integration (both from memory; section and equation numbers not checked).
 * One look, Pfa = exp(−T): common practice.
 */
export function thresholdFromPfa(pfa: number, looks: number): number {
  if (!(pfa > 0 && pfa < 1) || !isValidLooks(looks)) return Number.NaN;
  return gammaincinv(pfa, looks, true);
}

/** Parameters of {@link pdExact}. */
export interface PdExactParams {
  /** Per-look SNR after coherent integration, linear power ratio, ≥ 0 (mean over the fluctuation). */
  snrLinear: number;
  /** False-alarm probability, in (0, 1). */
  pfa: number;
  /** Number of looks integrated non-coherently, integer ≥ 1. */
  looks: number;
  /** Swerling case 0–4. */
  swerling: SwerlingCase;
}

/**
 * Shape r of the gamma law of the total signal energy over the N looks (chi-square of 2r degrees
 * of freedom): ∞ steady, 1 (case 1), N (case 2), 2 (case 3), 2N (case 4).
 *
 * Inputs: `swerling` 0–4; `looks` N, integer ≥ 1 (not checked here: pdExact validates it; cases 2 and 4
 * return N and 2N as given, so NaN looks give NaN).
 * Output: r, dimensionless, ≥ 1, or +Infinity for case 0. Edges: a case outside 0–4 gives NaN.
 * References: the parameter K of Shnidman, "Determination of required SNR values", IEEE Trans. AES
 * 38(3), 2002, pp. 1059–1064 (title, pages and the name K from memory; equation/table number not
 * checked); the chi-square family with 2K degrees of freedom: Swerling, IRE Trans. IT-6(2), 1960, and
 * Shnidman, IEEE Trans. AES 31(3), 1995 (both from memory, sections not checked).
 */
export function fluctuationShape(swerling: SwerlingCase, looks: number): number {
  switch (swerling) {
    case 0:
      return Number.POSITIVE_INFINITY;
    case 1:
      return 1;
    case 2:
      return looks;
    case 3:
      return 2;
    case 4:
      return 2 * looks;
    default:
      return Number.NaN;
  }
}

/**
 * Exact probability of detection of N non-coherently integrated square-law looks, Swerling 0–4.
 * Case 0 is the generalised Marcum Q, Pd = Q_N(√(2N·SNR), √(2T)); the fluctuating cases are its
 * average over the chi-square RCS law, a negative-binomial mixture of incomplete gammas. Computed by
 * {@link gammaMixtureSf}.
 * References (all from memory; equation numbers not checked, so sections are cited): steady target as a
 * Poisson-weighted series of incomplete gammas, Shnidman, "The calculation of the probability of
 * detection and the generalized Marcum Q-function", IEEE Trans. Inf. Theory 35(2), 1989, pp. 389–400,
 * §II; chi-square (Swerling 1–4) targets, Shnidman, "Radar detection probabilities and their
 * calculation", IEEE Trans. AES 31(3), 1995, pp. 928–950; the four cases, Swerling, "Probability of
 * detection for fluctuating targets", IRE Trans. IT-6(2), 1960, pp. 269–308; textbook treatment,
 * Richards FRSP 2nd ed., 2014, ch. 6 (Swerling models and noncoherent integration).
 *
 * Inputs (one PdExactParams object): `snrLinear` ≥ 0 per look, a linear power ratio (−10…+40 dB is the
 * tested range, any finite value is valid); `pfa` in (0, 1) (tested 1e-9…1e-3); `looks` integer ≥ 1
 * (tested 1…30); `swerling` 0–4.
 * Output: Pd, a probability in [Pfa, 1].
 * Edges: snr = 0 gives Pfa; snr = ∞ gives 1; NaN, negative SNR or any input out of domain gives NaN.
 */
export function pdExact(p: PdExactParams): number {
  const { snrLinear, pfa, looks, swerling } = p;
  if (!(snrLinear >= 0) || !isSwerlingCase(swerling)) return Number.NaN;
  const threshold = thresholdFromPfa(pfa, looks);
  if (Number.isNaN(threshold)) return Number.NaN;
  if (snrLinear === 0) return pfa;
  const pd = gammaMixtureSf({
    order: looks,
    x: threshold,
    mean: looks * snrLinear,
    shape: fluctuationShape(swerling, looks),
  });
  // Pd ≥ Pfa holds exactly; the floor only removes the ≈1e-15 relative round-trip difference between
  // Q(N, Q⁻¹(N, Pfa)) and Pfa, so that Pd never dips below its value at zero SNR.
  return Math.max(pd, pfa);
}

/** Parameters of {@link requiredSnrDb}. */
export interface RequiredSnrParams {
  /** Required probability of detection, in (0, 1). */
  pd: number;
  /** False-alarm probability, in (0, 1). */
  pfa: number;
  /** Number of looks integrated non-coherently, integer ≥ 1. */
  looks: number;
  /** Swerling case 0–4. */
  swerling: SwerlingCase;
}

/**
 * Required per-look SNR (after coherent integration) to reach a probability of detection: the
 * inverse of {@link pdExact} in SNR, by bracketing and Brent's method on the SNR in dB
 * (Brent, "Algorithms for Minimization without Derivatives", 1973, ch. 4, procedure zero).
 * References: the quantity that Albersheim's equation (steady target) and Shnidman's equation
 * (Swerling 0–4) approximate in closed form (Richards, FRSP 2nd ed., 2014, ch. 6; Shnidman, IEEE Trans.
 * AES 38(3), 2002; both from memory, equation numbers not checked), here found exactly from the Pd of
 * pdExact (Shnidman 1989 and 1995, see pdExact).
 *
 * Inputs (one RequiredSnrParams object): `pd` in (0, 1); `pfa` in (0, 1); `looks` integer ≥ 1;
 * `swerling` 0–4 (all dimensionless).
 * Output: per-look SNR in dB (a power ratio), to 1e-9 dB.
 * Edges: pd ≤ pfa gives −Infinity (noise alone reaches it); NaN or out-of-domain inputs give NaN;
 * a Pd so close to 1 that no SNR below 400 dB reaches it gives Infinity.
 */
export function requiredSnrDb(p: RequiredSnrParams): number {
  const { pd, pfa, looks, swerling } = p;
  if (!(pd > 0 && pd < 1) || !(pfa > 0 && pfa < 1) || !isValidLooks(looks) || !isSwerlingCase(swerling)) {
    return Number.NaN;
  }
  if (pd <= pfa) return Number.NEGATIVE_INFINITY;
  const f = (snrDb: number): number => pdExact({ snrLinear: dbToLinear(snrDb), pfa, looks, swerling }) - pd;

  let lo = SEARCH_LOW_DB;
  let flo = f(lo);
  while (flo >= 0) {
    if (lo <= -SEARCH_LIMIT_DB) return Number.NEGATIVE_INFINITY;
    lo -= SEARCH_STEP_DB;
    flo = f(lo);
  }
  let hi = SEARCH_HIGH_DB;
  let fhi = f(hi);
  while (fhi < 0) {
    if (hi >= SEARCH_LIMIT_DB) return Number.POSITIVE_INFINITY;
    lo = hi;
    flo = fhi;
    hi += SEARCH_STEP_DB;
    fhi = f(hi);
  }
  return brentRoot(f, lo, hi, flo, fhi);
}

/** Brent's root finder on a bracket [a, b] with f(a)·f(b) ≤ 0 (Brent 1973, ch. 4, procedure zero). */
function brentRoot(f: (x: number) => number, a0: number, b0: number, fa0: number, fb0: number): number {
  let a = a0;
  let b = b0;
  let fa = fa0;
  let fb = fb0;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let i = 0; i < MAX_ROOT_ITERATIONS; i++) {
    if (fb * fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + ROOT_TOL_DB / 2;
    const m = (c - b) / 2;
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      // Secant or inverse quadratic interpolation.
      let pp: number;
      let qq: number;
      const s = fb / fa;
      if (a === c) {
        pp = 2 * m * s;
        qq = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        pp = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        qq = (qa - 1) * (r - 1) * (s - 1);
      }
      if (pp > 0) qq = -qq;
      else pp = -pp;
      if (2 * pp < Math.min(3 * m * qq - Math.abs(tol * qq), Math.abs(e * qq))) {
        e = d;
        d = pp / qq;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}
