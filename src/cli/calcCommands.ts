/**
 * The `calc` subcommands as plain functions: inputs already parsed, a result object out (printed as
 * JSON with --json) plus the lines of its text form. No I/O here, so tests call them directly.
 */
import { pdExact, requiredSnrDb, type SwerlingCase } from "../coverage/detection.ts";
import { type LinkBudget, linkBudget } from "../coverage/linkBudget.ts";
import { radarHorizonM } from "../coverage/propagation.ts";
import { radarEquationParams, rangeForSnr } from "../coverage/radarEquation.ts";
import type { RadarModel } from "../coverage/radarModel.ts";
import { type RadarExposure, RF_SAFETY_CAUTIONS, radarExposure } from "../coverage/rfExposure.ts";
import { dbsmToM2, dbToLinear } from "../coverage/units.ts";
import { instrumentedRangeM } from "../coverage/waveform.ts";

export interface CalcOutput<T> {
  result: T;
  lines: string[];
}

export interface DetectionArgs {
  pfa: number;
  looks: number;
  swerling: SwerlingCase;
}

const fmtDb = (x: number) => `${x >= 0 ? " " : ""}${x.toFixed(2)}`;
const fmtM = (m: number) =>
  m >= 1000 ? `${(m / 1000).toFixed(3)} km` : m >= 10 ? `${m.toFixed(1)} m` : `${m.toFixed(2)} m`;
const fmtW = (w: number) =>
  w >= 1e6 ? `${(w / 1e6).toFixed(2)} MW` : w >= 1000 ? `${(w / 1000).toFixed(2)} kW` : `${w.toFixed(2)} W`;
/** Probabilities as typed by engineers: 0.9, 1e-6. */
const fmtP = (p: number) => (p < 1e-3 ? p.toExponential() : String(p));
const caseName = (k: SwerlingCase) => (k === 0 ? "Swerling 0 (steady)" : `Swerling ${k}`);

/** `calc pd`: exact Pd for a per-look SNR. */
export function pdCommand(a: DetectionArgs & { snrDb: number }): CalcOutput<{
  pd: number;
  snrDb: number;
  pfa: number;
  looks: number;
  swerling: SwerlingCase;
}> {
  const pd = pdExact({ snrLinear: dbToLinear(a.snrDb), pfa: a.pfa, looks: a.looks, swerling: a.swerling });
  return {
    result: { pd, snrDb: a.snrDb, pfa: a.pfa, looks: a.looks, swerling: a.swerling },
    lines: [
      `Pd = ${pd.toFixed(6)}`,
      `  per-look SNR ${a.snrDb} dB, Pfa ${fmtP(a.pfa)}, ${a.looks} look(s) integrated non-coherently, ${caseName(a.swerling)}`,
    ],
  };
}

/** `calc snr`: per-look SNR needed for a Pd. */
export function snrCommand(a: DetectionArgs & { pd: number }): CalcOutput<{
  requiredSnrDb: number;
  pd: number;
  pfa: number;
  looks: number;
  swerling: SwerlingCase;
}> {
  const snrDb = requiredSnrDb({ pd: a.pd, pfa: a.pfa, looks: a.looks, swerling: a.swerling });
  return {
    result: { requiredSnrDb: snrDb, pd: a.pd, pfa: a.pfa, looks: a.looks, swerling: a.swerling },
    lines: [
      `Required per-look SNR = ${snrDb.toFixed(2)} dB`,
      `  for Pd ${a.pd}, Pfa ${fmtP(a.pfa)}, ${a.looks} look(s) integrated non-coherently, ${caseName(a.swerling)}`,
    ],
  };
}

export interface RangeResult {
  radar: { id: string; name: string };
  rcsDbsm: number;
  requiredSnrDb: number;
  /** Free-space range where the required SNR is reached, m (peak gains, no atmosphere, no masking). */
  freeSpaceRangeM: number;
  /** The radar's instrumented window, m. */
  blindZoneM: number;
  instrumentedRangeM: number;
  /** Detection range after the instrumented limit, m. */
  detectionRangeM: number;
  limitedBy: "snr" | "instrumented range";
  budget: LinkBudget;
  pd: number;
  pfa: number;
  looks: number;
  swerling: SwerlingCase;
}

/** `calc range`: free-space detection range of a radar model and the link budget at that range. */
export function rangeCommand(
  a: DetectionArgs & { radar: RadarModel; rcsDbsm: number; pd: number },
): CalcOutput<RangeResult> {
  const reqDb = requiredSnrDb({ pd: a.pd, pfa: a.pfa, looks: a.looks, swerling: a.swerling });
  const params = radarEquationParams(a.radar, { rcsM2: dbsmToM2(a.rcsDbsm) });
  const freeSpaceRangeM = rangeForSnr(params, reqDb);
  const { minM, maxM } = instrumentedRangeM(a.radar);
  const detectionRangeM = Math.min(freeSpaceRangeM, maxM);
  const budget = linkBudget(params, freeSpaceRangeM);
  const result: RangeResult = {
    radar: { id: a.radar.id, name: a.radar.name },
    rcsDbsm: a.rcsDbsm,
    requiredSnrDb: reqDb,
    freeSpaceRangeM,
    blindZoneM: minM,
    instrumentedRangeM: maxM,
    detectionRangeM,
    limitedBy: freeSpaceRangeM > maxM ? "instrumented range" : "snr",
    budget,
    pd: a.pd,
    pfa: a.pfa,
    looks: a.looks,
    swerling: a.swerling,
  };
  const lines = [
    `${a.radar.name} against ${a.rcsDbsm} dBsm, ${caseName(a.swerling)}, Pd ${a.pd}, Pfa ${fmtP(a.pfa)}, ${a.looks} look(s)`,
    `Required per-look SNR      ${reqDb.toFixed(2)} dB`,
    `Free-space range           ${fmtM(freeSpaceRangeM)}  (peak gains, no atmosphere, no masking)`,
    `Instrumented window        ${fmtM(result.blindZoneM)} to ${fmtM(maxM)}`,
    `Detection range            ${fmtM(detectionRangeM)}  (limited by ${result.limitedBy})`,
    "",
    `Link budget at ${fmtM(freeSpaceRangeM)}:`,
    ...budget.rows.map((r) => {
      const sign = r.kind === "result" ? "=" : r.sign > 0 ? "+" : "-";
      return `  ${sign} ${r.label.padEnd(34)} ${fmtDb(r.valueDb).padStart(9)} ${r.unit}`;
    }),
  ];
  return { result, lines };
}

/** `calc horizon`: radar horizon over a smooth Earth of effective factor k. */
export function horizonCommand(a: { mastM: number; targetM: number; k: number }): CalcOutput<{
  horizonM: number;
  mastM: number;
  targetM: number;
  k: number;
}> {
  const horizonM = radarHorizonM({ antennaHeightM: a.mastM, targetHeightM: a.targetM, k: a.k });
  return {
    result: { horizonM, mastM: a.mastM, targetM: a.targetM, k: a.k },
    lines: [
      `Radar horizon = ${fmtM(horizonM)}`,
      `  antenna ${a.mastM} m and target ${a.targetM} m above smooth ground, effective-Earth factor k = ${a.k.toFixed(4)}`,
    ],
  };
}

/** `calc exposure`: RF exposure compliance distances of a radar model, with the cautions. */
export function exposureCommand(
  radar: RadarModel,
): CalcOutput<RadarExposure & { cautions: readonly string[] }> {
  const e = radarExposure(radar);
  const table = (rows: RadarExposure["stopped"]) =>
    rows.map(
      (r) =>
        `  ${r.standard.padEnd(18)} ${r.population.padEnd(15)} limit ${r.limitWPerM2.toFixed(2).padStart(6)} W/m²  distance ${fmtM(r.distanceM)}`,
    );
  return {
    result: { ...e, cautions: RF_SAFETY_CAUTIONS },
    lines: [
      `${radar.name}: peak EIRP ${fmtW(e.peakEirpW)}, duty cycle ${(e.dutyCycle * 100).toFixed(2)} %, scan dwell fraction ${(e.scanFraction * 100).toFixed(2)} %`,
      `Antenna stopped (plan with these), average EIRP ${fmtW(e.averageEirpStoppedW)}:`,
      ...table(e.stopped),
      `Scanning as specified, average EIRP ${fmtW(e.averageEirpScanningW)}:`,
      ...table(e.scanning),
      "",
      "Cautions:",
      ...RF_SAFETY_CAUTIONS.map((c) => `  - ${c}`),
    ],
  };
}
