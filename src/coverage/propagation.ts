/**
 * Propagation geometry and losses on a terrestrial path: free-space loss, effective Earth radius,
 * Earth curvature and radar horizon, Fresnel zones, and single knife-edge diffraction.
 * All lengths in metres, frequencies in hertz, losses in dB (positive = loss).
 * Gaseous and rain attenuation live in atmosphere.ts and rain.ts; the exact knife-edge form in
 * fresnelIntegrals.ts.
 */
import { DEFAULT_EFFECTIVE_EARTH_FACTOR, EARTH_RADIUS_M, SPEED_OF_LIGHT_M_PER_S } from "./constants.ts";
import { fieldRatioToDb } from "./units.ts";

/**
 * ITU-R P.526-15 eq. (31) coefficients: J(v) = 6.9 + 20·log10(√((v − 0.1)² + 1) + v − 0.1) dB,
 * used for v > −0.78 (0 dB at and below it).
 */
const KNIFE_EDGE_OFFSET_DB = 6.9;
const KNIFE_EDGE_V_SHIFT = 0.1;
const KNIFE_EDGE_V_MIN = -0.78;

/**
 * Wavelength λ = c/f, m, with c the defined speed of light in vacuum. The one definition in the model
 * (waveform.ts and the radar equation use this one).
 * @param frequencyHz carrier frequency, Hz, finite > 0.
 * @returns metres; NaN for a zero, negative, infinite or NaN frequency.
 * Reference: λ = c/f (common practice); c = 299 792 458 m/s exactly (SI definition, constants.ts).
 */
export function wavelengthM(frequencyHz: number): number {
  if (!(frequencyHz > 0 && frequencyHz < Number.POSITIVE_INFINITY)) return Number.NaN;
  return SPEED_OF_LIGHT_M_PER_S / frequencyHz;
}

/**
 * Free-space basic transmission loss between isotropic antennas, L = 20·log10(4πd/λ).
 * @param p.frequencyHz carrier frequency, Hz, > 0.
 * @param p.distanceM straight-line distance, m, > 0 (far field of both antennas).
 * @returns one-way loss in dB; NaN for distance ≤ 0, frequency ≤ 0 or NaN input.
 * Reference: ITU-R P.525-4 eq. (4): L = 32.4 + 20 log f(MHz) + 20 log d(km) dB (32.4 is the rounded
 * constant; this function uses the exact 20·log10(4π/c) and so differs from eq. (4) by < 0.05 dB).
 */
export function freeSpaceLossDb(p: { frequencyHz: number; distanceM: number }): number {
  const lambdaM = wavelengthM(p.frequencyHz);
  if (!(p.distanceM > 0) || Number.isNaN(lambdaM)) return Number.NaN;
  return fieldRatioToDb((4 * Math.PI * p.distanceM) / lambdaM);
}

/**
 * Effective Earth radius a_e = k·a, which turns ray bending in a standard atmosphere into straight rays
 * over a larger Earth.
 * @param k effective-Earth-radius factor, dimensionless, > 0 (4/3 standard atmosphere, 1 geometric,
 *   Infinity flat Earth). Sub-refraction k < 1 is allowed; ducting (k ≤ 0) is outside the model.
 * @returns metres; Infinity for k = Infinity; NaN for k ≤ 0 or NaN.
 * Reference: ITU-R P.452-17 eq. (6a), a_e = 6371·k km; ITU-R P.834.
 */
export function effectiveEarthRadiusM(k: number = DEFAULT_EFFECTIVE_EARTH_FACTOR): number {
  if (!(k > 0)) return Number.NaN;
  return k * EARTH_RADIUS_M;
}

/**
 * Curvature drop: how far the effective Earth's surface falls below the tangent plane at distance d,
 * h = d²/(2·k·a) (parabolic approximation, valid for d ≪ a_e).
 * @param distanceM ground distance from the tangent point, m, ≥ 0.
 * @param k effective-Earth-radius factor, > 0 (see effectiveEarthRadiusM).
 * @returns metres, ≥ 0; 0 at d = 0 or k = Infinity; NaN for d < 0, k ≤ 0 or NaN.
 * Reference: geometry of a sphere of radius k·a to second order in d/a_e (common practice; the d²/(2a_e)
 * terms of ITU-R P.452 path profiles).
 */
export function curvatureDropM(distanceM: number, k: number = DEFAULT_EFFECTIVE_EARTH_FACTOR): number {
  const aeM = effectiveEarthRadiusM(k);
  if (!(distanceM >= 0) || Number.isNaN(aeM)) return Number.NaN;
  return (distanceM * distanceM) / (2 * aeM);
}

/**
 * Earth bulge at a point of a path: height of the effective Earth's surface above the chord joining the
 * two ends, h = d1·d2/(2·k·a).
 * @param p.d1M distance from one end, m, ≥ 0; p.d2M distance from the other end, m, ≥ 0.
 * @param p.k effective-Earth-radius factor, > 0 (default 4/3).
 * @returns metres, ≥ 0; 0 at either end; NaN for a negative distance, k ≤ 0 or NaN.
 * Reference: path-profile formula h = d1·d2/(12.74·k) m with d in km (common practice, from memory).
 */
export function earthBulgeM(p: { d1M: number; d2M: number; k?: number }): number {
  const aeM = effectiveEarthRadiusM(p.k ?? DEFAULT_EFFECTIVE_EARTH_FACTOR);
  if (!(p.d1M >= 0) || !(p.d2M >= 0) || Number.isNaN(aeM)) return Number.NaN;
  return (p.d1M * p.d2M) / (2 * aeM);
}

/**
 * Radar horizon: the longest ground distance at which a target is still above the effective Earth's
 * horizon, d = √(2·k·a·h1) + √(2·k·a·h2) (smooth sphere, parabolic approximation, the inverse of
 * curvatureDropM).
 * @param p.antennaHeightM antenna height above the (smooth) ground, m, ≥ 0.
 * @param p.targetHeightM target height above the ground, m, ≥ 0.
 * @param p.k effective-Earth-radius factor, > 0 (default 4/3).
 * @returns metres; Infinity for k = Infinity; NaN for a negative height, k ≤ 0 or NaN.
 * Reference: handbook horizon formula d ≈ 4.12(√h1 + √h2) km with h in metres for k = 4/3, 3.57√h km
 * for k = 1 (common practice in radar handbooks; from memory).
 */
export function radarHorizonM(p: { antennaHeightM: number; targetHeightM: number; k?: number }): number {
  const aeM = effectiveEarthRadiusM(p.k ?? DEFAULT_EFFECTIVE_EARTH_FACTOR);
  if (!(p.antennaHeightM >= 0) || !(p.targetHeightM >= 0) || Number.isNaN(aeM)) return Number.NaN;
  if (aeM === Number.POSITIVE_INFINITY) return Number.POSITIVE_INFINITY;
  return Math.sqrt(2 * aeM * p.antennaHeightM) + Math.sqrt(2 * aeM * p.targetHeightM);
}

/**
 * Radius of the n-th Fresnel zone at a point of a path, r_n = √(n·λ·d1·d2/(d1 + d2)).
 * @param p.frequencyHz carrier frequency, Hz, > 0.
 * @param p.d1M, p.d2M distances from the point to the two ends, m, ≥ 0, not both 0.
 * @param p.zone zone number n, a positive integer (default 1).
 * @returns metres; 0 at either end; NaN for a negative distance, both 0, f ≤ 0, a bad zone or NaN.
 * Reference: ITU-R P.526-15 §3.1 eq. (2) (number from memory): R1 = 550·√(d1·d2/((d1 + d2)·f)) m,
 * d in km, f in MHz (550 is the rounded value of √(c·10⁻³)); here the exact form with λ = c/f.
 */
export function fresnelZoneRadiusM(p: {
  frequencyHz: number;
  d1M: number;
  d2M: number;
  zone?: number;
}): number {
  const zone = p.zone ?? 1;
  const lambdaM = wavelengthM(p.frequencyHz);
  const totalM = p.d1M + p.d2M;
  if (!Number.isInteger(zone) || zone < 1) return Number.NaN;
  if (!(p.d1M >= 0) || !(p.d2M >= 0) || !(totalM > 0) || Number.isNaN(lambdaM)) return Number.NaN;
  if (totalM === Number.POSITIVE_INFINITY) return Number.NaN;
  return Math.sqrt((zone * lambdaM * p.d1M * p.d2M) / totalM);
}

/**
 * Fresnel–Kirchhoff diffraction parameter of a single knife edge, v = h·√((2/λ)·(1/d1 + 1/d2)).
 * @param p.clearanceM height h of the edge's top above the straight line between the two ends, m, any
 *   real: positive = the edge obstructs the line of sight (v > 0, loss > 6 dB); negative = the line
 *   clears the edge by |h|.
 * @param p.d1M, p.d2M distances from the ends to the edge, m, > 0.
 * @param p.wavelengthM wavelength, m, > 0.
 * @returns dimensionless v; NaN for a distance or wavelength ≤ 0, or NaN input.
 * Reference: ITU-R P.526-15 §4.1 eq. (26) (equation number from memory).
 */
export function fresnelParameterV(p: {
  clearanceM: number;
  d1M: number;
  d2M: number;
  wavelengthM: number;
}): number {
  if (!(p.d1M > 0) || !(p.d2M > 0) || !(p.wavelengthM > 0) || Number.isNaN(p.clearanceM)) return Number.NaN;
  return p.clearanceM * Math.sqrt((2 / p.wavelengthM) * (1 / p.d1M + 1 / p.d2M));
}

/**
 * Single knife-edge diffraction loss J(v), the ITU-R approximation
 * J(v) = 6.9 + 20·log10(√((v − 0.1)² + 1) + v − 0.1) dB for v > −0.78, and 0 dB otherwise.
 * @param v Fresnel–Kirchhoff parameter (fresnelParameterV), dimensionless, any real.
 * @returns loss in dB, ≥ 0: 6.03 dB at v = 0, rising about 20 dB per decade of v for v ≫ 1; 0 for
 *   v ≤ −0.78 (the exact form's lit-region ripples, a gain of up to 1.37 dB near v = −1.22, are not
 *   modelled); +∞ for v = +∞; NaN for NaN. Against the exact form (knifeEdgeLossExactDb) it is within
 *   0.13 dB for v > −0.78 (measured maximum 0.124 dB near v = 4.6; tests/reference/propagation.test.ts).
 * Reference: ITU-R P.526-15 §4.1 eq. (31).
 */
export function knifeEdgeLossDb(v: number): number {
  if (Number.isNaN(v)) return Number.NaN;
  if (!(v > KNIFE_EDGE_V_MIN)) return 0;
  if (v === Number.POSITIVE_INFINITY) return Number.POSITIVE_INFINITY;
  const u = v - KNIFE_EDGE_V_SHIFT;
  return KNIFE_EDGE_OFFSET_DB + fieldRatioToDb(Math.sqrt(u * u + 1) + u);
}
