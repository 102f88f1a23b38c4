/**
 * Gaseous (clear-air) attenuation on a horizontal path: oxygen and water vapour, by the approximate
 * formulas of ITU-R P.676-10 Annex 2 §1 (valid 1–350 GHz at pressures and temperatures near the surface).
 *
 * Simplified model, error stated: against the line-by-line model of ITU-R P.676-12 Annex 1 at
 * 1013.25 hPa (dry), 15 °C, 7.5 g/m³ (ITU-R validation values, tests/fixtures/propagation/
 * p676-12-annex1-validation.json) the total specific attenuation agrees within 9 % and 0.011 dB/km
 * from 1 to 40 GHz (0.2 dB two way over 10 km), within 11 % from 40 to 100 GHz including the 60 GHz
 * oxygen complex, and within 12.5 % from 100 to 350 GHz (measured in tests/reference/atmosphere.test.ts).
 * The formulas are a fit to an older line catalogue; the line-by-line model is not implemented.
 */
import {
  STANDARD_PRESSURE_HPA,
  STANDARD_TEMPERATURE_K,
  STANDARD_WATER_VAPOUR_DENSITY_G_PER_M3,
} from "./constants.ts";

/** Frequency range of the Annex 2 formulas, GHz (ITU-R P.676-10 Annex 2 §1). */
const MIN_FREQUENCY_GHZ = 1;
const MAX_FREQUENCY_GHZ = 350;
/** Reference pressure and temperature of the normalised ratios r_p = p/1013, r_t = 288/T (P.676-10 Annex 2). */
const REFERENCE_PRESSURE_HPA = 1013;
const REFERENCE_TEMPERATURE_K = 288;
/** The formula's coefficients yield dB/km after these scale factors (P.676-10 Annex 2 eqs. 22, 23). */
const OXYGEN_SCALE = 1e-3;
const WATER_VAPOUR_SCALE = 1e-4;
const HZ_PER_GHZ = 1e9;
const M_PER_KM = 1000;

/** Surface conditions for the gaseous model. Defaults: the standard atmosphere at sea level. */
export interface AtmosphereConditions {
  /** Total (dry + vapour) air pressure, hPa, in (0, 1100]. Default 1013.25. */
  totalPressureHpa?: number;
  /** Air temperature, K, in [200, 330]. Default 288.15 (15 °C). */
  temperatureK?: number;
  /** Water-vapour density, g/m³, in [0, 50]. Default 7.5. */
  waterVapourDensityGPerM3?: number;
}

interface Ratios {
  rp: number;
  rt: number;
  rho: number;
}

function ratios(opts: AtmosphereConditions | undefined): Ratios | undefined {
  const p = opts?.totalPressureHpa ?? STANDARD_PRESSURE_HPA;
  const t = opts?.temperatureK ?? STANDARD_TEMPERATURE_K;
  const rho = opts?.waterVapourDensityGPerM3 ?? STANDARD_WATER_VAPOUR_DENSITY_G_PER_M3;
  if (!(p > 0) || !(t > 0) || !(rho >= 0) || !Number.isFinite(p + t + rho)) return undefined;
  return { rp: p / REFERENCE_PRESSURE_HPA, rt: REFERENCE_TEMPERATURE_K / t, rho };
}

function frequencyGhz(frequencyHz: number): number {
  const f = frequencyHz / HZ_PER_GHZ;
  return f >= MIN_FREQUENCY_GHZ && f <= MAX_FREQUENCY_GHZ ? f : Number.NaN;
}

/** φ(r_p, r_t, a, b, c, d) = r_p^a · r_t^b · exp(c(1 − r_p) + d(1 − r_t)) (P.676-10 Annex 2 eq. 22u). */
function phi(r: Ratios, a: number, b: number, c: number, d: number): number {
  return r.rp ** a * r.rt ** b * Math.exp(c * (1 - r.rp) + d * (1 - r.rt));
}

/**
 * Specific attenuation by dry air (oxygen and pressure-induced nitrogen), horizontal path at the surface.
 * @param frequencyHz frequency, Hz, in [1, 350] GHz.
 * @param opts surface pressure, temperature and vapour density (defaults: standard sea-level atmosphere).
 * @returns dB/km, ≥ 0; NaN outside 1–350 GHz, for out-of-domain conditions or NaN.
 * Reference: ITU-R P.676-10 Annex 2 §1, eq. (22a)–(22f) (piecewise in frequency; the 54–66 GHz
 * segments interpolate log-linearly between the tabulated 54, 58, 60, 62, 64 and 66 GHz values; the
 * recommendation's segments join within 0.7 %, at 54, 66 and 120 GHz).
 */
export function oxygenAttenuationDbPerKm(frequencyHz: number, opts?: AtmosphereConditions): number {
  const f = frequencyGhz(frequencyHz);
  const r = ratios(opts);
  if (Number.isNaN(f) || r === undefined) return Number.NaN;
  const { rp, rt } = r;
  if (f <= 54) {
    const xi1 = phi(r, 0.0717, -1.8132, 0.0156, -1.6515);
    const xi2 = phi(r, 0.5146, -4.6368, -0.1921, -5.7416);
    const xi3 = phi(r, 0.3414, -6.5851, 0.213, -8.5854);
    return (
      ((7.2 * rt ** 2.8) / (f * f + 0.34 * rp * rp * rt ** 1.6) +
        (0.62 * xi3) / ((54 - f) ** (1.16 * xi1) + 0.83 * xi2)) *
      f *
      f *
      rp *
      rp *
      OXYGEN_SCALE
    );
  }
  if (f <= 66) {
    const g54 = 2.192 * phi(r, 1.8286, -1.9487, 0.4051, -2.8509);
    const g58 = 12.59 * phi(r, 1.0045, 3.561, 0.1588, 1.2834);
    const g60 = 15.0 * phi(r, 0.9003, 4.1335, 0.0427, 1.6088);
    const g62 = 14.28 * phi(r, 0.9886, 3.4176, 0.1827, 1.3429);
    const g64 = 6.819 * phi(r, 1.432, 0.6258, 0.3177, -0.5914);
    const g66 = 1.908 * phi(r, 2.0717, -4.1404, 0.491, -4.8718);
    if (f <= 60) {
      return Math.exp(
        (Math.log(g54) / 24) * (f - 58) * (f - 60) -
          (Math.log(g58) / 8) * (f - 54) * (f - 60) +
          (Math.log(g60) / 12) * (f - 54) * (f - 58),
      );
    }
    if (f <= 62) return g60 + ((g62 - g60) * (f - 60)) / 2;
    return Math.exp(
      (Math.log(g62) / 8) * (f - 64) * (f - 66) -
        (Math.log(g64) / 4) * (f - 62) * (f - 66) +
        (Math.log(g66) / 8) * (f - 62) * (f - 64),
    );
  }
  if (f <= 120) {
    const xi4 = phi(r, -0.0112, 0.0092, -0.1033, -0.0009);
    const xi5 = phi(r, 0.2705, -2.7192, -0.3016, -4.1033);
    const xi6 = phi(r, 0.2445, -5.9191, 0.0422, -8.0719);
    const xi7 = phi(r, -0.1833, 6.5589, -0.2402, 6.131);
    return (
      (3.02e-4 * rt ** 3.5 +
        (0.283 * rt ** 3.8) / ((f - 118.75) ** 2 + 2.91 * rp * rp * rt ** 1.6) +
        (0.502 * xi6 * (1 - 0.0163 * xi7 * (f - 66))) / ((f - 66) ** (1.4346 * xi4) + 1.15 * xi5)) *
      f *
      f *
      rp *
      rp *
      OXYGEN_SCALE
    );
  }
  const delta = -0.00306 * phi(r, 3.211, -14.94, 1.583, -16.37);
  const continuum = 3.02e-4 / (1 + 1.9e-5 * f ** 1.5);
  const line118 = (0.283 * rt ** 0.3) / ((f - 118.75) ** 2 + 2.91 * rp * rp * rt ** 1.6);
  return (continuum + line118) * f * f * rp * rp * rt ** 3.5 * OXYGEN_SCALE + delta;
}

/** g(f, f_i) = 1 + ((f − f_i)/(f + f_i))², the line-shape correction of P.676-10 Annex 2 eq. (23). */
function lineShape(f: number, fi: number): number {
  const q = (f - fi) / (f + fi);
  return 1 + q * q;
}

/**
 * Specific attenuation by water vapour, horizontal path at the surface.
 * @param frequencyHz frequency, Hz, in [1, 350] GHz.
 * @param opts surface pressure, temperature and vapour density (defaults: standard sea-level atmosphere).
 * @returns dB/km, ≥ 0 (0 for dry air); NaN outside 1–350 GHz, for out-of-domain conditions or NaN.
 * Reference: ITU-R P.676-10 Annex 2 §1, eq. (23a) with η1, η2 of eqs. (23b)–(23c) (numbers from memory).
 */
export function waterVapourAttenuationDbPerKm(frequencyHz: number, opts?: AtmosphereConditions): number {
  const f = frequencyGhz(frequencyHz);
  const r = ratios(opts);
  if (Number.isNaN(f) || r === undefined) return Number.NaN;
  const { rp, rt, rho } = r;
  const e1 = 0.955 * rp * rt ** 0.68 + 0.006 * rho;
  const e2 = 0.735 * rp * rt ** 0.5 + 0.0353 * rt ** 4 * rho;
  const x = 1 - rt;
  const sum =
    ((3.98 * e1 * Math.exp(2.23 * x)) / ((f - 22.235) ** 2 + 9.42 * e1 * e1)) * lineShape(f, 22) +
    (11.96 * e1 * Math.exp(0.7 * x)) / ((f - 183.31) ** 2 + 11.14 * e1 * e1) +
    (0.081 * e1 * Math.exp(6.44 * x)) / ((f - 321.226) ** 2 + 6.29 * e1 * e1) +
    (3.66 * e1 * Math.exp(1.6 * x)) / ((f - 325.153) ** 2 + 9.22 * e1 * e1) +
    (25.37 * e1 * Math.exp(1.09 * x)) / (f - 380) ** 2 +
    (17.4 * e1 * Math.exp(1.46 * x)) / (f - 448) ** 2 +
    ((844.6 * e1 * Math.exp(0.17 * x)) / (f - 557) ** 2) * lineShape(f, 557) +
    ((290 * e1 * Math.exp(0.41 * x)) / (f - 752) ** 2) * lineShape(f, 752) +
    ((8.3328e4 * e2 * Math.exp(0.99 * x)) / (f - 1780) ** 2) * lineShape(f, 1780);
  return sum * f * f * rt ** 2.5 * rho * WATER_VAPOUR_SCALE;
}

/**
 * Total specific gaseous attenuation γ = γ_o + γ_w on a horizontal path at the surface.
 * @param frequencyHz frequency, Hz, in [1, 350] GHz.
 * @param opts surface conditions (defaults: 1013.25 hPa, 288.15 K, 7.5 g/m³).
 * @returns dB/km, ≥ 0; NaN outside 1–350 GHz or for out-of-domain conditions. Error of this simplified
 *   model: see the file header (within 9 % of P.676-12 Annex 1 below 40 GHz, 12.5 % to 350 GHz).
 * Reference: ITU-R P.676-10 Annex 2 §1, eqs. (22)–(23); total as in P.676 Annex 1 eq. (1).
 */
export function gaseousAttenuationDbPerKm(frequencyHz: number, opts?: AtmosphereConditions): number {
  return oxygenAttenuationDbPerKm(frequencyHz, opts) + waterVapourAttenuationDbPerKm(frequencyHz, opts);
}

/**
 * Two-way gaseous loss over a radar's range, L = 2·γ·r, with γ at the surface along the whole path
 * (an upper bound for paths that climb, since γ falls with height).
 * @param p.frequencyHz frequency, Hz, in [1, 350] GHz.
 * @param p.rangeM one-way slant range, m, ≥ 0.
 * @param p.atmosphere surface conditions (defaults: standard sea-level atmosphere).
 * @returns dB, ≥ 0; 0 at zero range; NaN for a negative range, a frequency outside 1–350 GHz or NaN.
 * Reference: ITU-R P.676-12 §2.1 terrestrial path, A = γ·r0 (eq. 10, number from memory), two way.
 */
export function twoWayGasLossDb(p: {
  frequencyHz: number;
  rangeM: number;
  atmosphere?: AtmosphereConditions;
}): number {
  if (!(p.rangeM >= 0)) return Number.NaN;
  return (2 * gaseousAttenuationDbPerKm(p.frequencyHz, p.atmosphere) * p.rangeM) / M_PER_KM;
}
