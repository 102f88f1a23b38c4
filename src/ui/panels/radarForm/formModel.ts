/**
 * The radar-model form's data: which field sits at which model path with which display unit, the
 * conversion between the text the user types (GHz, µs, MHz, km…) and the SI value stored in the model,
 * the draft built from a model, the candidate model built from a draft, and the routing of
 * parseRadarModel errors to the field whose path they name. Conversions happen here only, at the form's
 * edge; the plan always holds SI values.
 */
import type { PatternCut, RadarModel } from "../../../coverage/radarModel";
import type { FieldError } from "../../../io/schemaFields";
import { parseTypedNumber } from "../../numberText";

/** A display unit: its symbol, the SI unit the model stores, and how many of those one of it is (GHz: 1e9 Hz). */
export interface DisplayUnit {
  symbol: string;
  si: string;
  siPerUnit: number;
}

// Decimal SI prefixes (definitions of the prefixes).
const GIGA = 1e9;
const MEGA = 1e6;
const KILO = 1e3;
const MICRO = 1e-6;

export const UNITS = {
  ghz: { symbol: "GHz", si: "Hz", siPerUnit: GIGA },
  mhz: { symbol: "MHz", si: "Hz", siPerUnit: MEGA },
  khz: { symbol: "kHz", si: "Hz", siPerUnit: KILO },
  us: { symbol: "µs", si: "s", siPerUnit: MICRO },
  s: { symbol: "s", si: "s", siPerUnit: 1 },
  w: { symbol: "W", si: "W", siPerUnit: 1 },
  m: { symbol: "m", si: "m", siPerUnit: 1 },
  km: { symbol: "km", si: "m", siPerUnit: KILO },
  db: { symbol: "dB", si: "dB", siPerUnit: 1 },
  dbi: { symbol: "dBi", si: "dBi", siPerUnit: 1 },
  deg: { symbol: "°", si: "deg", siPerUnit: 1 },
  count: { symbol: "", si: "", siPerUnit: 1 },
} as const satisfies Record<string, DisplayUnit>;

/** Significant digits kept when converting, enough for any typed value and free of binary noise. */
const SIGNIFICANT_DIGITS = 12;

/** The SI value shown in a display unit, as text (e.g. 9.4e9 Hz in GHz → "9.4"); "" for undefined. */
export function siToText(si: number | undefined, unit: DisplayUnit): string {
  if (si === undefined) return "";
  if (!Number.isFinite(si)) return String(si);
  return String(Number((si / unit.siPerUnit).toPrecision(SIGNIFICANT_DIGITS)));
}

/**
 * Typed text in a display unit to the SI value: undefined for empty text, NaN for text that is not a
 * number (as parseTypedNumber reads it: a decimal comma and 4/3 are accepted, 0x10 and 1,000 are not).
 */
export function textToSi(text: string, unit: DisplayUnit): number | undefined {
  if (text.trim() === "") return undefined;
  const typed = parseTypedNumber(text);
  if (!typed.ok) return Number.NaN;
  return Number((typed.value * unit.siPerUnit).toPrecision(SIGNIFICANT_DIGITS));
}

const NUMBER = String.raw`-?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?`;

/**
 * A schema message about a field restated in the field's display unit: beside a GHz field, "2000000 is
 * below the 3000000 Hz limit" reads "0.002 GHz is below the 0.003 GHz limit". Every number the message
 * gives in the stored SI unit, and the value it got, is shown in the display unit; numbers in other
 * units (a PRF in a pulse-width message) are left as they are.
 */
export function messageInUnit(message: string, unit: DisplayUnit): string {
  if (unit.siPerUnit === 1 || unit.si === "") return message;
  const show = (n: string) => `${siToText(Number(n), unit)} ${unit.symbol}`;
  return message
    .replace(
      new RegExp(`^(${NUMBER}) is (below|above) the (${NUMBER}) ${unit.si} limit`),
      (_, v, side, lim) => {
        return `${show(v)} is ${side} the ${show(lim)} limit`;
      },
    )
    .replace(new RegExp(`\\(got (${NUMBER})\\)`), (_, v) => `(got ${show(v)})`)
    .replace(new RegExp(`(${NUMBER}) ${unit.si}\\b`, "g"), (_, v) => show(v))
    .replace(`a number in ${unit.si}`, `a number in ${unit.symbol}`);
}

/** One numeric input of the form. */
export interface NumberSpec {
  /** Model path as parseRadarModel names it, e.g. "transmitter.peakPowerW". */
  path: string;
  label: string;
  unit: DisplayUnit;
  /** Optional fields are left out of the model when their text is empty. */
  optional?: boolean;
  hint?: string;
}

export const TXRX_FIELDS: NumberSpec[] = [
  { path: "frequencyHz", label: "Carrier frequency", unit: UNITS.ghz },
  { path: "transmitter.peakPowerW", label: "Peak power", unit: UNITS.w },
  { path: "receiver.noiseFigureDb", label: "Noise figure", unit: UNITS.db },
  { path: "receiver.systemLossDb", label: "System losses (two-way)", unit: UNITS.db },
];

export const PULSED_FIELDS: NumberSpec[] = [
  { path: "waveform.pulseWidthS", label: "Pulse width", unit: UNITS.us },
  { path: "waveform.prfHz", label: "PRF", unit: UNITS.khz },
  { path: "waveform.pulsesIntegrated", label: "Pulses integrated (coherent)", unit: UNITS.count },
  {
    path: "waveform.bandwidthHz",
    label: "Compressed bandwidth",
    unit: UNITS.mhz,
    optional: true,
    hint: "empty: 1/pulse width",
  },
];

export const FMCW_FIELDS: NumberSpec[] = [
  { path: "waveform.chirpBandwidthHz", label: "Chirp bandwidth", unit: UNITS.mhz },
  { path: "waveform.chirpDurationS", label: "Chirp ramp duration", unit: UNITS.us },
  { path: "waveform.chirpPeriodS", label: "Chirp period", unit: UNITS.us },
  { path: "waveform.chirpsPerFrame", label: "Chirps per frame (coherent)", unit: UNITS.count },
  { path: "waveform.ifSampleRateHz", label: "IF sample rate", unit: UNITS.mhz },
];

/** The numeric fields of an antenna at `prefix` ("txAntenna" or "rxAntenna"). */
export function antennaFields(prefix: AntennaPrefix): NumberSpec[] {
  return [
    { path: `${prefix}.peakGainDbi`, label: "Peak gain", unit: UNITS.dbi },
    { path: `${prefix}.azBeamwidthDeg`, label: "Azimuth beamwidth (−3 dB)", unit: UNITS.deg },
    { path: `${prefix}.elBeamwidthDeg`, label: "Elevation beamwidth (−3 dB)", unit: UNITS.deg },
    { path: `${prefix}.sidelobeFloorDb`, label: "Sidelobe floor", unit: UNITS.db },
  ];
}

export const SCAN_FIELDS: Record<ScanKind, NumberSpec[]> = {
  staring: [
    { path: "scan.fovAzDeg", label: "Azimuth field of view", unit: UNITS.deg },
    { path: "scan.fovElDeg", label: "Elevation field of view", unit: UNITS.deg },
  ],
  sector: [
    { path: "scan.sectorWidthDeg", label: "Sector width", unit: UNITS.deg },
    { path: "scan.fovElDeg", label: "Elevation field of view", unit: UNITS.deg },
  ],
  rotating: [{ path: "scan.fovElDeg", label: "Elevation field of view", unit: UNITS.deg }],
};

export const RANGE_FIELDS: NumberSpec[] = [
  { path: "blindZoneM", label: "Blind zone (blanking)", unit: UNITS.m },
  { path: "maxInstrumentedRangeM", label: "Maximum instrumented range", unit: UNITS.km },
  { path: "updateIntervalS", label: "Update interval", unit: UNITS.s },
  {
    path: "looksIntegrated",
    label: "Looks integrated (non-coherent)",
    unit: UNITS.count,
    optional: true,
    hint: "empty: 1",
  },
  {
    path: "clutterImprovementDb",
    label: "Clutter improvement",
    unit: UNITS.db,
    optional: true,
    hint: "empty: none",
  },
];

export type AntennaPrefix = "txAntenna" | "rxAntenna";
export type ScanKind = RadarModel["scan"]["kind"];
export type CutPath = `${AntennaPrefix}.${"azCut" | "elCut"}`;
export const CUT_PATHS: CutPath[] = [
  "txAntenna.azCut",
  "txAntenna.elCut",
  "rxAntenna.azCut",
  "rxAntenna.elCut",
];

/** Every numeric field of the form, whichever kind is chosen (paths are unique). */
export function allNumberFields(): NumberSpec[] {
  const seen = new Map<string, NumberSpec>();
  for (const s of [
    ...TXRX_FIELDS,
    ...PULSED_FIELDS,
    ...FMCW_FIELDS,
    ...antennaFields("txAntenna"),
    ...antennaFields("rxAntenna"),
    ...Object.values(SCAN_FIELDS).flat(),
    ...RANGE_FIELDS,
  ]) {
    seen.set(s.path, s);
  }
  return [...seen.values()];
}

/** The form's state: the typed text of every field (numbers, name and choices) and the measured cuts. */
export interface RadarDraft {
  /** Text by model path; choices too: "waveform.kind", "waveform.ifSampling", "scan.kind", "*.mainBeam". */
  texts: Record<string, string>;
  /** Receive antenna the same as transmit (no rxAntenna in the model). */
  rxSame: boolean;
  cuts: Partial<Record<CutPath, PatternCut>>;
}

function readPath(obj: unknown, path: string): unknown {
  let cur: unknown = obj;
  for (const key of path.split(".")) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = (cur as Record<string, unknown>)[key];
  }
  return cur;
}

function writePath(obj: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split(".");
  let cur = obj;
  for (const key of keys.slice(0, -1)) {
    if (typeof cur[key] !== "object" || cur[key] === null) cur[key] = {};
    cur = cur[key] as Record<string, unknown>;
  }
  cur[keys[keys.length - 1]] = value;
}

/** The draft of a model: its values in display units; receive fields copied from transmit when absent. */
export function draftFromModel(m: RadarModel): RadarDraft {
  const source = { ...m, rxAntenna: m.rxAntenna ?? m.txAntenna };
  const texts: Record<string, string> = { name: m.name };
  for (const s of allNumberFields()) {
    const v = readPath(source, s.path);
    texts[s.path] = typeof v === "number" ? siToText(v, s.unit) : "";
  }
  texts["waveform.kind"] = m.waveform.kind;
  texts["waveform.ifSampling"] = m.waveform.kind === "fmcw" ? m.waveform.ifSampling : "real";
  texts["scan.kind"] = m.scan.kind;
  texts["txAntenna.mainBeam"] = m.txAntenna.mainBeam;
  texts["rxAntenna.mainBeam"] = source.rxAntenna.mainBeam;
  const cuts: RadarDraft["cuts"] = {};
  for (const p of CUT_PATHS) {
    const c = readPath(source, p) as PatternCut | undefined;
    if (c) cuts[p] = c;
  }
  return { texts, rxSame: m.rxAntenna === undefined, cuts };
}

/** The fields that belong to the model in this draft's choices (waveform and scan kind, receive antenna). */
export function activeNumberFields(d: RadarDraft): NumberSpec[] {
  const kind = d.texts["waveform.kind"] === "fmcw" ? FMCW_FIELDS : PULSED_FIELDS;
  const scan = SCAN_FIELDS[(d.texts["scan.kind"] as ScanKind) ?? "rotating"] ?? SCAN_FIELDS.rotating;
  return [
    ...TXRX_FIELDS,
    ...kind,
    ...antennaFields("txAntenna"),
    ...(d.rxSame ? [] : antennaFields("rxAntenna")),
    ...scan,
    ...RANGE_FIELDS,
  ];
}

/**
 * The candidate model of a draft, as a plain JSON value for parseRadarModel, and the errors found
 * before validation (text that is not a number). `base` supplies what the form does not edit (id,
 * invented).
 */
export function candidateFromDraft(
  base: RadarModel,
  d: RadarDraft,
): { json: Record<string, unknown>; textErrors: FieldError[] } {
  const json: Record<string, unknown> = { id: base.id, name: d.texts.name ?? "" };
  if (base.invented !== undefined) json.invented = base.invented;
  writePath(json, "waveform.kind", d.texts["waveform.kind"]);
  if (d.texts["waveform.kind"] === "fmcw")
    writePath(json, "waveform.ifSampling", d.texts["waveform.ifSampling"]);
  writePath(json, "scan.kind", d.texts["scan.kind"]);
  writePath(json, "txAntenna.mainBeam", d.texts["txAntenna.mainBeam"]);
  if (!d.rxSame) writePath(json, "rxAntenna.mainBeam", d.texts["rxAntenna.mainBeam"]);
  const textErrors: FieldError[] = [];
  for (const s of activeNumberFields(d)) {
    const text = d.texts[s.path] ?? "";
    const v = textToSi(text, s.unit);
    if (v === undefined) {
      if (!s.optional) writePath(json, s.path, undefined);
      continue;
    }
    if (Number.isNaN(v)) textErrors.push({ path: s.path, message: `"${text.trim()}" is not a number` });
    writePath(json, s.path, v);
  }
  for (const p of CUT_PATHS) {
    const cut = d.cuts[p];
    if (cut && !(d.rxSame && p.startsWith("rxAntenna"))) writePath(json, p, cut);
  }
  return { json, textErrors };
}

/** Model paths that errors can be shown beside: every field, the cut rows and the name. */
export function errorTargets(): string[] {
  return [
    "name",
    "waveform.kind",
    "waveform.ifSampling",
    "scan.kind",
    ...allNumberFields().map((s) => s.path),
    ...CUT_PATHS,
  ];
}

/**
 * Routes errors to the field whose path they name: an error at `p`, `p.x` or `p[i]` belongs to the
 * longest such target `p`. Errors that name no field of the form come back in `other`.
 */
export function routeErrors(
  errors: readonly FieldError[],
  targets: readonly string[] = errorTargets(),
  units: ReadonlyMap<string, DisplayUnit> = new Map(allNumberFields().map((f) => [f.path, f.unit])),
): { byPath: Map<string, string[]>; other: FieldError[] } {
  const byPath = new Map<string, string[]>();
  const other: FieldError[] = [];
  for (const e of errors) {
    let best: string | undefined;
    for (const t of targets) {
      const hit = e.path === t || e.path.startsWith(`${t}.`) || e.path.startsWith(`${t}[`);
      if (hit && (best === undefined || t.length > best.length)) best = t;
    }
    if (best === undefined) {
      other.push(e);
      continue;
    }
    const rest = e.path.slice(best.length);
    const list = byPath.get(best) ?? [];
    const unit = units.get(best);
    const message = unit ? messageInUnit(e.message, unit) : e.message;
    list.push(rest ? `${rest.replace(/^\./, "")}: ${message}` : message);
    byPath.set(best, list);
  }
  return { byPath, other };
}

/**
 * Validation errors of a draft: text errors first; parse errors at a path that already has a text
 * error are dropped (they would only repeat it as NaN).
 */
export function mergeErrors(
  textErrors: readonly FieldError[],
  parseErrors: readonly FieldError[],
): FieldError[] {
  const bad = new Set(textErrors.map((e) => e.path));
  return [...textErrors, ...parseErrors.filter((e) => !bad.has(e.path))];
}
