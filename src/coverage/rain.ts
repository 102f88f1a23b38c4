/**
 * Rain attenuation: specific attenuation γ_R = k·R^α (ITU-R P.838-3) with the frequency-dependent
 * coefficients from the recommendation's regression formulas (eqs. 2 and 3, Tables 1–4), combined for
 * the polarisation tilt and path elevation (eqs. 4 and 5). Valid 1–1000 GHz.
 */
import { degToRad } from "./units.ts";

const HZ_PER_GHZ = 1e9;
const M_PER_KM = 1000;
const MIN_FREQUENCY_GHZ = 1;
const MAX_FREQUENCY_GHZ = 1000;

/** One P.838-3 regression: Σ a_j·exp(−((log10 f − b_j)/c_j)²) + m·log10 f + c. */
interface Regression {
  a: readonly number[];
  b: readonly number[];
  c: readonly number[];
  m: number;
  c0: number;
}

/** ITU-R P.838-3 Table 1: coefficients for k_H (the regression gives log10 k_H). */
const K_H: Regression = {
  a: [-5.3398, -0.35351, -0.23789, -0.94158],
  b: [-0.10008, 1.2697, 0.86036, 0.64552],
  c: [1.13098, 0.454, 0.15354, 0.16817],
  m: -0.18961,
  c0: 0.71147,
};

/** ITU-R P.838-3 Table 2: coefficients for k_V (the regression gives log10 k_V). */
const K_V: Regression = {
  a: [-3.80595, -3.44965, -0.39902, 0.50167],
  b: [0.56934, -0.22911, 0.73042, 1.07319],
  c: [0.81061, 0.51059, 0.11899, 0.27195],
  m: -0.16398,
  c0: 0.63297,
};

/** ITU-R P.838-3 Table 3: coefficients for α_H. */
const ALPHA_H: Regression = {
  a: [-0.14318, 0.29591, 0.32177, -5.3761, 16.1721],
  b: [1.82442, 0.77564, 0.63773, -0.9623, -3.2998],
  c: [-0.55187, 0.19822, 0.13164, 1.47828, 3.4399],
  m: 0.67849,
  c0: -1.95537,
};

/** ITU-R P.838-3 Table 4: coefficients for α_V. */
const ALPHA_V: Regression = {
  a: [-0.07771, 0.56727, -0.20238, -48.2991, 48.5833],
  b: [2.3384, 0.95545, 1.1452, 0.791669, 0.791459],
  c: [-0.76284, 0.54039, 0.26809, 0.116226, 0.116479],
  m: -0.053739,
  c0: 0.83433,
};

function regression(r: Regression, log10F: number): number {
  let sum = r.m * log10F + r.c0;
  for (let j = 0; j < r.a.length; j++) {
    const z = (log10F - r.b[j]) / r.c[j];
    sum += r.a[j] * Math.exp(-z * z);
  }
  return sum;
}

/** Rain coefficients at one frequency: the horizontal and vertical values and their combination. */
export interface RainCoefficients {
  /** k for horizontal polarisation, (dB/km)/(mm/h)^α. */
  kH: number;
  /** α for horizontal polarisation, dimensionless. */
  alphaH: number;
  /** k for vertical polarisation. */
  kV: number;
  /** α for vertical polarisation. */
  alphaV: number;
  /** k for the given polarisation tilt and path elevation (eq. 4). */
  k: number;
  /** α for the given polarisation tilt and path elevation (eq. 5). */
  alpha: number;
}

/** Polarisation and path geometry for the rain coefficients. */
export interface RainGeometry {
  /**
   * Polarisation tilt angle τ relative to the horizontal, degrees: 0 horizontal, 90 vertical,
   * 45 circular. Default 0 (horizontal, the larger attenuation below about 30 GHz: the conservative choice).
   */
  polarisationTiltDeg?: number;
  /** Path elevation angle θ, degrees, in [−90, 90]. Default 0 (a terrestrial path). */
  elevationDeg?: number;
}

/**
 * ITU-R P.838-3 rain coefficients k and α at one frequency, for a polarisation tilt and path elevation.
 * @param frequencyHz frequency, Hz, in [1, 1000] GHz.
 * @param geometry polarisation tilt τ (degrees, default 0 = horizontal) and path elevation θ (degrees,
 *   default 0).
 * @returns k_H, α_H, k_V, α_V from eqs. (2)–(3) and Tables 1–4, and the combined
 *   k = [k_H + k_V + (k_H − k_V)·cos²θ·cos 2τ]/2 (eq. 4),
 *   α = [k_H·α_H + k_V·α_V + (k_H·α_H − k_V·α_V)·cos²θ·cos 2τ]/(2k) (eq. 5);
 *   every field NaN outside 1–1000 GHz or for NaN input.
 * Reference: ITU-R P.838-3 (03/2005), eqs. (1)–(5), Tables 1–4.
 */
export function rainCoefficients(frequencyHz: number, geometry?: RainGeometry): RainCoefficients {
  const fGhz = frequencyHz / HZ_PER_GHZ;
  const tauRad = degToRad(geometry?.polarisationTiltDeg ?? 0);
  const thetaRad = degToRad(geometry?.elevationDeg ?? 0);
  if (!(fGhz >= MIN_FREQUENCY_GHZ && fGhz <= MAX_FREQUENCY_GHZ) || !Number.isFinite(tauRad + thetaRad)) {
    const nan = Number.NaN;
    return { kH: nan, alphaH: nan, kV: nan, alphaV: nan, k: nan, alpha: nan };
  }
  const log10F = Math.log10(fGhz);
  const kH = 10 ** regression(K_H, log10F);
  const kV = 10 ** regression(K_V, log10F);
  const alphaH = regression(ALPHA_H, log10F);
  const alphaV = regression(ALPHA_V, log10F);
  const cosTheta = Math.cos(thetaRad);
  const mix = cosTheta * cosTheta * Math.cos(2 * tauRad);
  const k = (kH + kV + (kH - kV) * mix) / 2;
  const alpha = (kH * alphaH + kV * alphaV + (kH * alphaH - kV * alphaV) * mix) / (2 * k);
  return { kH, alphaH, kV, alphaV, k, alpha };
}

/**
 * Specific attenuation by rain, γ_R = k·R^α.
 * @param p.frequencyHz frequency, Hz, in [1, 1000] GHz.
 * @param p.rainRateMmPerH rain rate R, mm/h, ≥ 0 (e.g. 5 moderate, 25 heavy, 100 tropical downpour).
 * @param p.polarisationTiltDeg, p.elevationDeg as in rainCoefficients (defaults 0, 0).
 * @returns dB/km, ≥ 0; 0 for R = 0; NaN for R < 0, a frequency outside 1–1000 GHz or NaN.
 * Reference: ITU-R P.838-3 eq. (1).
 */
export function rainAttenuationDbPerKm(
  p: { frequencyHz: number; rainRateMmPerH: number } & RainGeometry,
): number {
  if (!(p.rainRateMmPerH >= 0)) return Number.NaN;
  const { k, alpha } = rainCoefficients(p.frequencyHz, p);
  if (p.rainRateMmPerH === 0) return Number.isNaN(k) ? Number.NaN : 0;
  return k * p.rainRateMmPerH ** alpha;
}

/**
 * Two-way rain loss over a radar's range, L = 2·γ_R·min(r, rain extent), with uniform rain along the
 * wetted part of the path (no path-reduction factor: an upper bound for a given point rain rate).
 * @param p.rangeM one-way range, m, ≥ 0.
 * @param p.rainExtentM length of the path inside rain, m, ≥ 0 (default: the whole range).
 * @param p.frequencyHz, p.rainRateMmPerH, p.polarisationTiltDeg, p.elevationDeg as in rainAttenuationDbPerKm.
 * @returns dB, ≥ 0; NaN for a negative range or extent, a bad frequency or rain rate, or NaN.
 * Reference: ITU-R P.838-3 eq. (1) applied along the path, two way (common practice).
 */
export function twoWayRainLossDb(
  p: { frequencyHz: number; rainRateMmPerH: number; rangeM: number; rainExtentM?: number } & RainGeometry,
): number {
  const extentM = p.rainExtentM ?? p.rangeM;
  if (!(p.rangeM >= 0) || !(extentM >= 0)) return Number.NaN;
  return (2 * rainAttenuationDbPerKm(p) * Math.min(p.rangeM, extentM)) / M_PER_KM;
}
