/**
 * The generalised Marcum Q function and its gamma-averaged extension, built on the regularised
 * upper incomplete gamma function Q(a, x) = Γ(a, x)/Γ(a).
 *
 * A square-law sum of N looks, each with unit mean noise power, crosses the threshold x with
 * probability  Σ_k w_k · Q(N + k, x),  where w_k are the weights of the number k of "signal quanta":
 *  - Poisson(λ) for a steady signal of total energy λ (this is the generalised Marcum Q,
 *    Q_N(√(2λ), √(2x)); Shnidman, IEEE Trans. Inf. Theory 35(2), 1989, from memory),
 *  - negative binomial (shape r, mean λ) when λ itself is gamma distributed with shape r, which is
 *    the chi-square target of 2r degrees of freedom (Swerling's and Weinstock's fluctuating targets:
 *    the gamma average of a Poisson law is negative binomial, Johnson, Kemp & Kotz,
 *    "Univariate Discrete Distributions", 3rd ed., §5.3).
 * The derivation and the error bounds are in docs/model-spec.md ("Detection").
 */
import gammainc from "@stdlib/math-base-special-gammainc";

/** Below this a weight or term is carried in the log domain so that a long ramp-up never underflows. */
const LINEAR_FLOOR = 1e-250;
/** Relative size of the neglected remainder of a series. */
const SERIES_EPS = 1e-17;
/**
 * First guess of the last order a = N + K worth summing: x + 10·√x + 20 lies beyond the upper 1e-17
 * tail of a Poisson(x) count (Chernoff bound), so P(a, x) < 1e-17 there; it is checked and doubled if not.
 */
const ORDER_SPAN_SIGMAS = 10;
const ORDER_SPAN_OFFSET = 20;
/** Safety cap on the number of terms of the weight tail (never reached for finite inputs in range). */
const MAX_TAIL_TERMS = 50_000_000;

/** Parameters of {@link gammaMixtureSf}. */
export interface GammaMixtureParams {
  /** Number of summed looks N (the order of the incomplete gamma), integer ≥ 1. */
  order: number;
  /** Threshold x on the sum of looks, in units of the per-look mean noise power, ≥ 0. */
  x: number;
  /** Mean total signal-to-noise energy λ over the N looks (linear), ≥ 0. */
  mean: number;
  /**
   * Shape r ≥ 1 of the gamma law of λ (chi-square target with 2r degrees of freedom), or
   * `Infinity` for a steady signal (Poisson weights, the generalised Marcum Q).
   */
  shape: number;
}

/** ln(n!) for a non-negative integer n, by summation (exact to rounding; n is a look count). */
function lnFactorial(n: number): number {
  let s = 0;
  for (let i = 2; i <= n; i++) s += Math.log(i);
  return s;
}

/**
 * Probability that a square-law sum of N looks exceeds x when the signal energy is steady
 * (Poisson mixture) or chi-square distributed (negative-binomial mixture).
 *
 * Inputs: `order` N integer ≥ 1; `x` ≥ 0 (threshold / per-look noise power); `mean` λ ≥ 0 (linear,
 * total signal energy over the N looks = N · per-look SNR); `shape` r ≥ 1 or Infinity.
 * Output: probability in [0, 1].
 * Edges: λ = 0 gives Q(N, x) (the false-alarm probability); λ = ∞ or x = 0 gives 1; NaN, a
 * non-integer or < 1 order, negative x or λ, or r < 1 gives NaN.
 * Method: Pd = Σ_{k≤K} w_k Q(N+k, x) + Σ_{k>K} w_k, with Q(a+1, x) = Q(a, x) + xᵃe⁻ˣ/Γ(a+1) summed
 * upwards (additions only) and K chosen so that the lower incomplete gamma P(N+K, x) < 1e-17; the
 * weight tail is 1 − Σ_{k≤K} w_k when that is above one half, else summed directly with a geometric
 * bound on the remainder. Relative error ≈ 1e-13 over the detection range.
 * References: Q(a, x) = Γ(a, x)/Γ(a) (NIST DLMF eq. 8.2.4); the recurrence Γ(a+1, x) = a·Γ(a, x) + xᵃe⁻ˣ
 * divided by Γ(a+1) (NIST DLMF §8.8, eq. 8.8.2; Abramowitz & Stegun §6.5, 6.5.21/6.5.22; both equation
 * numbers from memory); the noncentral chi-square as a Poisson mixture of central ones (Abramowitz &
 * Stegun 26.4.25, equation number from memory); the Poisson series for Pd, Shnidman, IEEE Trans. Inf.
 * Theory 35(2), 1989, §II (from memory, equation numbers not checked); the gamma–Poisson (negative
 * binomial) mixture, Johnson, Kemp & Kotz, "Univariate Discrete Distributions", 3rd ed., 2005, §5.3
 * (from memory), as used for chi-square targets by Shnidman, IEEE Trans. AES 31(3), 1995 (from memory,
 * section not checked); the order cut-off from the Chernoff bound on a Poisson tail (common practice).
 */
export function gammaMixtureSf(p: GammaMixtureParams): number {
  const { order, x, mean, shape } = p;
  if (!(Number.isInteger(order) && order >= 1)) return Number.NaN;
  if (!(x >= 0) || !(mean >= 0) || !(shape >= 1)) return Number.NaN;
  if (x === 0 || mean === Number.POSITIVE_INFINITY) return 1;
  if (x === Number.POSITIVE_INFINITY) return 0;
  const q0 = gammainc(x, order, true, true);
  if (mean === 0) return q0;

  // Last index K: beyond it P(N+k, x) < SERIES_EPS, so Q(N+k, x) = 1 to double precision.
  let aMax = Math.ceil(x + ORDER_SPAN_SIGMAS * Math.sqrt(x) + ORDER_SPAN_OFFSET);
  while (gammainc(x, aMax, true, false) > SERIES_EPS) aMax = 2 * aMax + ORDER_SPAN_OFFSET;
  const kMax = Math.max(0, aMax - order);

  const poisson = shape === Number.POSITIVE_INFINITY;
  // Weights w_k: log w_0 and the step ratio w_{k+1}/w_k.
  const beta = poisson ? 0 : mean / shape;
  const lnRatioBase = poisson ? Math.log(mean) : Math.log(beta / (1 + beta));
  const ratioBase = poisson ? mean : beta / (1 + beta);
  let logW = poisson ? -mean : -shape * Math.log1p(beta);
  let w = Math.exp(logW);
  let linearW = w > LINEAR_FLOOR;

  // Terms t_a = x^a e^{-x} / Γ(a+1), a = N + k.
  let logT = order * Math.log(x) - x - lnFactorial(order);
  let t = Math.exp(logT);
  let linearT = t > LINEAR_FLOOR;
  const lnX = Math.log(x);

  let qa = q0;
  let sum = 0;
  let weightSum = 0;
  for (let k = 0; k <= kMax; k++) {
    const a = order + k;
    sum += w * qa;
    weightSum += w;
    // Q(a+1, x) = Q(a, x) + t_a.
    qa += t;
    qa = Math.min(qa, 1);
    if (linearT) t *= x / (a + 1);
    else {
      logT += lnX - Math.log(a + 1);
      t = Math.exp(logT);
      linearT = t > LINEAR_FLOOR;
    }
    // w_{k+1} = w_k · ratio_k.
    const ratio = poisson ? ratioBase / (k + 1) : (ratioBase * (shape + k)) / (k + 1);
    if (linearW) w *= ratio;
    else {
      logW += poisson ? lnRatioBase - Math.log(k + 1) : lnRatioBase + Math.log((shape + k) / (k + 1));
      w = Math.exp(logW);
      linearW = w > LINEAR_FLOOR;
    }
  }

  let tail: number;
  if (weightSum < 0.5) {
    tail = 1 - weightSum;
  } else {
    // Direct sum of the remaining weights; w currently holds w_{K+1}. The step ratio is
    // non-increasing in k for r ≥ 1 (and for Poisson), so once it is below 1 the remainder after
    // w_k is at most w_k · ρ / (1 − ρ).
    tail = 0;
    for (let k = kMax + 1, n = 0; n < MAX_TAIL_TERMS; k++, n++) {
      tail += w;
      const ratio = poisson ? ratioBase / (k + 1) : (ratioBase * (shape + k)) / (k + 1);
      if (ratio < 1 && (w * ratio) / (1 - ratio) <= SERIES_EPS * (sum + tail)) break;
      if (linearW) w *= ratio;
      else {
        logW += Math.log(ratio);
        w = Math.exp(logW);
        linearW = w > LINEAR_FLOOR;
      }
    }
  }
  const total = sum + tail;
  return Math.min(total, 1);
}

/**
 * Generalised Marcum Q function Q_M(a, b): the probability that a noncentral chi-square variable of
 * 2M degrees of freedom and noncentrality a² exceeds b²,
 * Q_M(a, b) = Σ_k e^(−a²/2) (a²/2)^k / k! · Q(M + k, b²/2).
 *
 * Inputs: `m` integer ≥ 1; `a` ≥ 0 (noncentrality amplitude, dimensionless, in units of the noise
 * standard deviation); `b` ≥ 0 (threshold amplitude, same units).
 * Output: probability in [0, 1]. Edges: b = 0 gives 1; a = 0 gives Q(M, b²/2); NaN, a or b < 0, or a
 * non-integer or < 1 order gives NaN. Equal to scipy.stats.ncx2.sf(b², 2M, a²).
 * References (from memory; equation numbers not checked, so sections are cited): definition, Marcum,
 * "A statistical theory of target detection by pulsed radar", IRE Trans. IT-6(2), 1960, pp. 59–267;
 * the Poisson series above, Shnidman, IEEE Trans. Inf. Theory 35(2), 1989, §II; the series as the
 * noncentral chi-square tail, Abramowitz & Stegun 26.4.25 (equation number from memory).
 */
export function marcumQ(m: number, a: number, b: number): number {
  if (!(a >= 0) || !(b >= 0)) return Number.NaN;
  return gammaMixtureSf({ order: m, x: (b * b) / 2, mean: (a * a) / 2, shape: Number.POSITIVE_INFINITY });
}
