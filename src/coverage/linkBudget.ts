/**
 * The radar link budget: every term of the radar equation in dB, as an ordered list of named rows with
 * sign and unit, in the bandwidth form an engineer reads on a data sheet:
 *
 *   SNR = P_t + G_t + G_r + λ² + σ − (4π)³ − R⁴ − k·T0·B·F_n − L_sys − L_atm − L_rain + B·τ + N + F⁴   [dB]
 *
 * B·τ (time-bandwidth product: pulse compression, or the range-FFT gain of an FMCW chirp) and N (coherent
 * integration of N pulses or chirps) are the processing gains; B cancels between them and the noise term,
 * so the rows sum to snrAtRangeDb exactly (to rounding). Used by the CLI, the report and the point
 * inspector. Rule RE5 in docs/model-spec.md.
 */

import { BOLTZMANN_J_PER_K, REFERENCE_TEMPERATURE_K } from "./constants.ts";
import { type RadarEquationParams, snrAtRangeDb } from "./radarEquation.ts";
import { linearToDb, wToDbw } from "./units.ts";
import { wavelengthM } from "./waveform.ts";

/** Identifier of a link-budget row, stable for tables, exports and tests. */
export type LinkBudgetRowId =
  | "peakPower"
  | "txGain"
  | "rxGain"
  | "wavelengthSquared"
  | "rcs"
  | "fourPiCubed"
  | "rangeFourth"
  | "noisePower"
  | "systemLoss"
  | "atmosphericLoss"
  | "rainLoss"
  | "timeBandwidth"
  | "coherentIntegration"
  | "propagationFactor"
  | "snr";

export interface LinkBudgetRow {
  id: LinkBudgetRowId;
  /** Plain-language label, e.g. "Receive gain towards target". */
  label: string;
  /** "term" rows add up to the "result" row (the last one). */
  kind: "term" | "result";
  /** +1 when the term adds to the SNR, −1 when it is subtracted, 0 for the result row. */
  sign: 1 | -1 | 0;
  /** The term's own value in its unit (e.g. R⁴ at 10 km is 160 dB(m⁴)); for the result, the SNR in dB. */
  valueDb: number;
  /** Unit of valueDb: "dBW", "dBi", "dB(m²)", "dBsm", "dB", "dB(m⁴)". */
  unit: string;
  /** sign · valueDb, dB: what the row contributes to the SNR (equal to valueDb for the result row). */
  contributionDb: number;
}

export interface LinkBudget {
  /** Slant range the budget is evaluated at, m. */
  rangeM: number;
  /** Term rows in display order, then the result row (SNR). */
  rows: LinkBudgetRow[];
  /** The SNR, dB: snrAtRangeDb(p, rangeM). */
  snrDb: number;
}

function term(
  id: LinkBudgetRowId,
  label: string,
  sign: 1 | -1,
  valueDb: number,
  unit: string,
): LinkBudgetRow {
  return { id, label, kind: "term", sign, valueDb, unit, contributionDb: sign * valueDb };
}

/**
 * Link budget at a range: the rows of the bandwidth form above, then the SNR.
 * The noise bandwidth B is p.noiseBandwidthHz (default 1/τ); it changes the noise and time-bandwidth rows
 * but not their sum. Losses appear as positive values with sign −1.
 * @param p radar-equation parameters, gains towards the target (RadarEquationParams).
 * @param rangeM slant range, m > 0.
 * @returns the budget; at R ≤ 0, NaN or p out of domain the SNR (and R⁴ row) follow snrAtRangeDb
 *   (R = 0: R⁴ row −Infinity, SNR +Infinity; R < 0 or NaN: NaN).
 * References: the radar equation in decibels, term by term (Skolnik, Introduction to Radar Systems,
 * 3rd ed., 2001, ch. 2; from memory, equation number not checked; Blake, Radar Range-Performance
 * Analysis, 1980 (Artech House ed. 1986), "Monostatic Radar Range Equation", p. 12; section title
 * and page from the book's contents, equation number not checked); k·T0 ≈ −204 dBW/Hz (common practice);
 * the pulse-compression gain B·τ (Richards, Fundamentals of Radar Signal Processing, 2nd ed., 2014,
 * ch. 4; from memory, section not checked); coherent-integration gain N (common practice).
 */
export function linkBudget(p: RadarEquationParams, rangeM: number): LinkBudget {
  const lambdaM = wavelengthM(p.frequencyHz);
  const bandwidthHz = p.noiseBandwidthHz ?? 1 / p.pulseDurationS;
  const noiseW = BOLTZMANN_J_PER_K * REFERENCE_TEMPERATURE_K * bandwidthHz;
  const rows: LinkBudgetRow[] = [
    term("peakPower", "Peak transmit power", 1, wToDbw(p.peakPowerW), "dBW"),
    term("txGain", "Transmit gain towards target", 1, p.txGainDbi, "dBi"),
    term("rxGain", "Receive gain towards target", 1, p.rxGainDbi, "dBi"),
    term("wavelengthSquared", "Wavelength squared λ²", 1, linearToDb(lambdaM * lambdaM), "dB(m²)"),
    term("rcs", "Target RCS σ", 1, linearToDb(p.rcsM2), "dBsm"),
    term("fourPiCubed", "Spreading constant (4π)³", -1, linearToDb((4 * Math.PI) ** 3), "dB"),
    term("rangeFourth", "Range to the fourth R⁴", -1, 2 * linearToDb(rangeM * rangeM), "dB(m⁴)"),
    term("noisePower", "Noise power k·T0·B·F_n", -1, wToDbw(noiseW) + p.noiseFigureDb, "dBW"),
    term("systemLoss", "System losses (two-way)", -1, p.systemLossDb, "dB"),
    term("atmosphericLoss", "Atmospheric loss (two-way)", -1, p.atmosphericLossDb ?? 0, "dB"),
    term("rainLoss", "Rain loss (two-way)", -1, p.rainLossDb ?? 0, "dB"),
    term("timeBandwidth", "Time-bandwidth product B·τ", 1, linearToDb(bandwidthHz * p.pulseDurationS), "dB"),
    term("coherentIntegration", "Coherent integration N", 1, linearToDb(p.pulsesIntegrated), "dB"),
    term("propagationFactor", "Propagation factor F⁴", 1, p.propagationFactorDb ?? 0, "dB"),
  ];
  const snrDb = snrAtRangeDb(p, rangeM);
  rows.push({
    id: "snr",
    label: "Signal-to-noise ratio",
    kind: "result",
    sign: 0,
    valueDb: snrDb,
    unit: "dB",
    contributionDb: snrDb,
  });
  return { rangeM, rows, snrDb };
}

/**
 * Sum of the contributions of the term rows, dB; equals budget.snrDb to floating-point rounding
 * (RE5). Provided for displays that show the check.
 */
export function sumOfTermsDb(budget: LinkBudget): number {
  let s = 0;
  for (const r of budget.rows) if (r.kind === "term") s += r.contributionDb;
  return s;
}
