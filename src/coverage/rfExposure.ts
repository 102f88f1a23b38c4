/**
 * RF exposure: far-field power density from EIRP, time averaging, the whole-body reference levels of
 * ICNIRP 2020 and FCC 47 CFR §1.1310, and the compliance distance at which a limit is met.
 * This is a planning estimate, not a compliance assessment: see RF_SAFETY_CAUTIONS.
 */
import { SPEED_OF_LIGHT_M_PER_S } from "./constants.ts";
import type { RadarModel } from "./radarModel.ts";
import { dbToLinear } from "./units.ts";

const HZ_PER_MHZ = 1e6;
/** 1 mW/cm² = 10 W/m² (unit definition: 1e-3 W / 1e-4 m²). */
const W_PER_M2_PER_MW_PER_CM2 = 10;
const S_PER_MIN = 60;

/** Reference levels of one standard, whole-body average incident power density, W/m². */
export interface ExposureLimitPair {
  /** General public (ICNIRP) / general population, uncontrolled (FCC), W/m². NaN where not defined. */
  publicWPerM2: number;
  /** Occupational (ICNIRP) / occupational, controlled (FCC), W/m². NaN where not defined. */
  occupationalWPerM2: number;
  /** Averaging time for the public limit, s. */
  publicAveragingTimeS: number;
  /** Averaging time for the occupational limit, s. */
  occupationalAveragingTimeS: number;
}

/** Whole-body reference levels at one frequency from both standards. */
export interface ExposureLimits {
  /** ICNIRP Guidelines (2020), whole-body reference levels (Table 5; local-exposure levels not modelled), >30 MHz–300 GHz. */
  icnirp: ExposureLimitPair;
  /** FCC 47 CFR §1.1310(e) Table 1, limits for maximum permissible exposure, 0.3 MHz–100 GHz. */
  fcc: ExposureLimitPair;
}

/**
 * Far-field power density of an antenna on its beam axis, S = EIRP/(4π·r²).
 * @param p.eirpW effective isotropic radiated power towards the point, W, ≥ 0 (peak or time-averaged;
 *   the result is of the same kind).
 * @param p.distanceM distance from the antenna, m, > 0; valid in the far field (beyond about 2D²/λ,
 *   see farFieldDistanceM); nearer, this estimate is usually high for aperture antennas but is no
 *   substitute for a near-field assessment.
 * @returns W/m², ≥ 0; NaN for distance ≤ 0, EIRP < 0 or NaN.
 * Reference: FCC OET Bulletin 65 (Ed. 97-01) eq. (3) with P·G = EIRP (common practice; eq. number from memory).
 */
export function powerDensityWPerM2(p: { eirpW: number; distanceM: number }): number {
  if (!(p.distanceM > 0) || !(p.eirpW >= 0)) return Number.NaN;
  return p.eirpW / (4 * Math.PI * p.distanceM * p.distanceM);
}

/**
 * Time-averaged EIRP towards a fixed point: peak EIRP × transmit duty cycle × scan fraction.
 * @param p.peakEirpW peak EIRP on the beam axis, W, ≥ 0.
 * @param p.dutyCycle fraction of time the transmitter radiates, in [0, 1] (pulse width × PRF for a
 *   pulsed radar, ramp time / chirp period × frame occupancy for FMCW; 1 for continuous wave).
 * @param p.scanFraction fraction of the averaging time the beam points at the point, in [0, 1]
 *   (about beamwidth/360° for a rotating antenna). Default 1: a stopped or staring antenna, the
 *   conservative case that a rotating radar also meets when its rotation stops.
 * @returns W, ≥ 0; NaN for a value outside its range or NaN.
 * Reference: FCC OET Bulletin 65 §2 (duty factor and scanning reduction of average power; common practice).
 */
export function timeAveragedEirpW(p: {
  peakEirpW: number;
  dutyCycle: number;
  scanFraction?: number;
}): number {
  const scan = p.scanFraction ?? 1;
  if (!(p.peakEirpW >= 0) || !(p.dutyCycle >= 0 && p.dutyCycle <= 1) || !(scan >= 0 && scan <= 1)) {
    return Number.NaN;
  }
  return p.peakEirpW * p.dutyCycle * scan;
}

/**
 * Far-field (Fraunhofer) distance of an aperture antenna, 2D²/λ.
 * @param p.apertureM largest dimension D of the antenna, m, > 0; p.frequencyHz, Hz, > 0.
 * @returns m; NaN for a non-positive or NaN input.
 * Reference: IEEE Std 145-2013 (far-field region, common practice); FCC OET Bulletin 65 §2.
 */
export function farFieldDistanceM(p: { apertureM: number; frequencyHz: number }): number {
  if (!(p.apertureM > 0) || !(p.frequencyHz > 0)) return Number.NaN;
  return (2 * p.apertureM * p.apertureM * p.frequencyHz) / SPEED_OF_LIGHT_M_PER_S;
}

function icnirpLimits(fMhz: number): ExposureLimitPair {
  // ICNIRP (2020) whole-body reference levels averaged over 30 min, incident power density S_inc,
  // occupational and general public (values from memory; ICNIRP gives none below 30 MHz):
  //   >30–400 MHz: 10 and 2 W/m²; >400–2000 MHz: f/40 and f/200 W/m² (f in MHz); >2–300 GHz: 50 and 10 W/m².
  const avg = 30 * S_PER_MIN;
  let occ = Number.NaN;
  let pub = Number.NaN;
  if (fMhz > 30 && fMhz <= 400) {
    occ = 10;
    pub = 2;
  } else if (fMhz > 400 && fMhz <= 2000) {
    occ = fMhz / 40;
    pub = fMhz / 200;
  } else if (fMhz > 2000 && fMhz <= 300_000) {
    occ = 50;
    pub = 10;
  }
  return {
    publicWPerM2: pub,
    occupationalWPerM2: occ,
    publicAveragingTimeS: avg,
    occupationalAveragingTimeS: avg,
  };
}

function fccLimits(fMhz: number): ExposureLimitPair {
  // 47 CFR §1.1310(e)(1) Table 1, power density in mW/cm² (f in MHz; values from memory):
  //   (A) occupational/controlled, 6 min: 0.3–3: 100; 3–30: 900/f²; 30–300: 1.0; 300–1500: f/300; 1500–100 000: 5.
  //   (B) general population/uncontrolled, 30 min: 0.3–1.34: 100; 1.34–30: 180/f²; 30–300: 0.2;
  //       300–1500: f/1500; 1500–100 000: 1.0.
  let occ = Number.NaN;
  let pub = Number.NaN;
  if (fMhz >= 0.3 && fMhz <= 100_000) {
    if (fMhz <= 3) occ = 100;
    else if (fMhz <= 30) occ = 900 / (fMhz * fMhz);
    else if (fMhz <= 300) occ = 1;
    else if (fMhz <= 1500) occ = fMhz / 300;
    else occ = 5;
    if (fMhz <= 1.34) pub = 100;
    else if (fMhz <= 30) pub = 180 / (fMhz * fMhz);
    else if (fMhz <= 300) pub = 0.2;
    else if (fMhz <= 1500) pub = fMhz / 1500;
    else pub = 1;
  }
  return {
    publicWPerM2: pub * W_PER_M2_PER_MW_PER_CM2,
    occupationalWPerM2: occ * W_PER_M2_PER_MW_PER_CM2,
    publicAveragingTimeS: 30 * S_PER_MIN,
    occupationalAveragingTimeS: 6 * S_PER_MIN,
  };
}

/**
 * Whole-body power-density reference levels at a frequency, from ICNIRP 2020 and FCC 47 CFR §1.1310.
 * @param frequencyHz frequency, Hz, > 0. ICNIRP power-density levels are given here for >30 MHz–300 GHz
 *   and FCC's for 0.3 MHz–100 GHz; outside them (or for NaN) the values are NaN.
 * @returns W/m² and averaging times in s (ICNIRP: 30 min for both; FCC: 30 min public, 6 min occupational).
 *   At a band edge the lower band's value applies (the tables' "f ≤" convention). Examples: 10 GHz gives
 *   10 and 50 W/m² from both; 900 MHz gives ICNIRP 4.5 / 22.5 and FCC 6 / 30 W/m².
 * Reference: ICNIRP, Health Physics 118(5):483–524 (2020), Table 5 whole-body (table number from memory);
 *   47 CFR §1.1310(e)(1) Table 1
 *   (1 mW/cm² = 10 W/m²). Values from memory; tests/reference/rfExposure.test.ts lists them.
 */
export function exposureLimits(frequencyHz: number): ExposureLimits {
  const fMhz = frequencyHz > 0 ? frequencyHz / HZ_PER_MHZ : Number.NaN;
  return { icnirp: icnirpLimits(fMhz), fcc: fccLimits(fMhz) };
}

/**
 * Compliance distance: the on-axis distance beyond which the far-field power density is below a limit,
 * r = √(F·EIRP_avg/(4π·S_limit)), with F a power reflection factor for a reflecting ground (1 = free space).
 * @param p.eirpAvgW time-averaged EIRP on the beam axis, W, ≥ 0 (timeAveragedEirpW).
 * @param p.limitWPerM2 power-density limit, W/m², > 0 (exposureLimits).
 * @param p.powerReflectionFactor F ≥ 1 (default 1); FCC OET Bulletin 65 uses 2.56 (field factor 1.6)
 *   for ground-level exposure with reflections (from memory).
 * @returns m, ≥ 0; 0 for zero EIRP; NaN for a limit ≤ 0, EIRP < 0, F < 1 or NaN.
 * Reference: inverse of powerDensityWPerM2; FCC OET Bulletin 65 §2 (common practice).
 */
export function complianceDistanceM(p: {
  eirpAvgW: number;
  limitWPerM2: number;
  powerReflectionFactor?: number;
}): number {
  const f = p.powerReflectionFactor ?? 1;
  if (!(p.eirpAvgW >= 0) || !(p.limitWPerM2 > 0) || !(f >= 1)) return Number.NaN;
  return Math.sqrt((f * p.eirpAvgW) / (4 * Math.PI * p.limitWPerM2));
}

/** One line of a compliance table: a standard, a population, its limit and the distance that meets it. */
export interface ComplianceRow {
  standard: "ICNIRP 2020" | "FCC 47 CFR 1.1310";
  population: "general public" | "occupational";
  /** Limit, W/m²; NaN where the standard gives none at this frequency. */
  limitWPerM2: number;
  /** Averaging time of the limit, s. */
  averagingTimeS: number;
  /** Compliance distance, m; NaN where the limit is NaN. */
  distanceM: number;
}

/**
 * Compliance distances for the general public and occupational limits of ICNIRP 2020 and FCC §1.1310.
 * @param p.frequencyHz frequency, Hz, > 0; p.eirpAvgW time-averaged EIRP, W, ≥ 0;
 *   p.powerReflectionFactor as in complianceDistanceM (default 1).
 * @returns four rows (ICNIRP public, ICNIRP occupational, FCC public, FCC occupational), NaN where a
 *   standard has no level at the frequency.
 * Reference: exposureLimits and complianceDistanceM.
 */
export function complianceTable(p: {
  frequencyHz: number;
  eirpAvgW: number;
  powerReflectionFactor?: number;
}): ComplianceRow[] {
  const limits = exposureLimits(p.frequencyHz);
  const row = (
    standard: ComplianceRow["standard"],
    population: ComplianceRow["population"],
    limitWPerM2: number,
    averagingTimeS: number,
  ): ComplianceRow => ({
    standard,
    population,
    limitWPerM2,
    averagingTimeS,
    distanceM: complianceDistanceM({
      eirpAvgW: p.eirpAvgW,
      limitWPerM2,
      powerReflectionFactor: p.powerReflectionFactor,
    }),
  });
  const { icnirp, fcc } = limits;
  return [
    row("ICNIRP 2020", "general public", icnirp.publicWPerM2, icnirp.publicAveragingTimeS),
    row("ICNIRP 2020", "occupational", icnirp.occupationalWPerM2, icnirp.occupationalAveragingTimeS),
    row("FCC 47 CFR 1.1310", "general public", fcc.publicWPerM2, fcc.publicAveragingTimeS),
    row("FCC 47 CFR 1.1310", "occupational", fcc.occupationalWPerM2, fcc.occupationalAveragingTimeS),
  ];
}

/** RF exposure figures of one radar model, for the stopped (worst) and the scanning case. */
export interface RadarExposure {
  /** Carrier frequency, Hz. */
  frequencyHz: number;
  /** Peak EIRP on the transmit beam axis, W: peak power × peak transmit gain. */
  peakEirpW: number;
  /** Transmit duty cycle, in [0, 1]. */
  dutyCycle: number;
  /** Fraction of time the beam dwells on a fixed point while scanning, in (0, 1]. */
  scanFraction: number;
  /** Time-averaged EIRP with the antenna stopped (or staring), W. */
  averageEirpStoppedW: number;
  /** Time-averaged EIRP while scanning as specified, W (equal to the stopped value for a staring radar). */
  averageEirpScanningW: number;
  /** Compliance rows for the stopped antenna: the figures to plan with. */
  stopped: ComplianceRow[];
  /** Compliance rows while scanning normally. */
  scanning: ComplianceRow[];
}

/**
 * RF exposure of a radar model: peak EIRP, duty cycle, scan dwell fraction and the compliance distances.
 * Duty cycle: pulse width × PRF for a pulsed waveform; ramp time / chirp period for FMCW (idle time
 * between frames ignored: an upper bound). Scan fraction: azimuth beamwidth / 360° when rotating,
 * azimuth beamwidth / sector width when sector-scanning, 1 when staring; each capped at 1.
 * @param radar a validated radar model (frequency, transmitter, waveform, transmit antenna, scan).
 * @returns powers in W, fractions in [0, 1], rows as complianceTable; NaN fields where an input is out
 *   of range (the schema in src/io rejects such models first).
 * Reference: timeAveragedEirpW, complianceTable (FCC OET Bulletin 65 §2, common practice).
 */
export function radarExposure(radar: RadarModel): RadarExposure {
  const peakEirpW = radar.transmitter.peakPowerW * dbToLinear(radar.txAntenna.peakGainDbi);
  const w = radar.waveform;
  const rawDuty = w.kind === "pulsed" ? w.pulseWidthS * w.prfHz : w.chirpDurationS / w.chirpPeriodS;
  const dutyCycle = Math.min(1, rawDuty);
  const beamDeg = radar.txAntenna.azBeamwidthDeg;
  const s = radar.scan;
  const rawScan =
    s.kind === "rotating" ? beamDeg / 360 : s.kind === "sector" ? beamDeg / s.sectorWidthDeg : 1;
  const scanFraction = Math.min(1, rawScan);
  const averageEirpStoppedW = timeAveragedEirpW({ peakEirpW, dutyCycle });
  const averageEirpScanningW = timeAveragedEirpW({ peakEirpW, dutyCycle, scanFraction });
  const frequencyHz = radar.frequencyHz;
  return {
    frequencyHz,
    peakEirpW,
    dutyCycle,
    scanFraction,
    averageEirpStoppedW,
    averageEirpScanningW,
    stopped: complianceTable({ frequencyHz, eirpAvgW: averageEirpStoppedW }),
    scanning: complianceTable({ frequencyHz, eirpAvgW: averageEirpScanningW }),
  };
}

/** The cautions printed with every exposure figure, in the report and on the command line. */
export const RF_SAFETY_CAUTIONS: readonly string[] = [
  "These distances are far-field estimates (S = EIRP/4πr²) on the beam axis. Close to the antenna, inside " +
    "about 2D²/λ, the far-field formula does not describe the field; it usually overstates the on-axis " +
    "density of an aperture antenna but is no substitute for a near-field calculation or a measurement.",
  "Time averaging assumes the stated duty cycle and scanning. A rotating or scanning antenna that stops, " +
    "or a transmitter fault, exposes the beam axis to the full average power: plan for the stopped case.",
  "Exposure limits, averaging times and the standards that apply differ between countries and change. " +
    "Defer to local regulations and to a licensed or accredited RF-safety practitioner for the compliance " +
    "assessment, signage and controlled zones.",
  "Operating a radar transmitter needs spectrum authorisation (a licence or an applicable exemption) from " +
    "the national regulator for its frequency, power and location; this plan does not grant or check it.",
  "Masts, poles and rooftops are work at height: follow local codes and a competent installer's method " +
    "statement for structure loading, fall protection and electrical safety, and switch the transmitter " +
    "off (lock out) before anyone works in front of the antenna.",
];
