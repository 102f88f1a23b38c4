/**
 * Numbers as the panels show them: latitude and longitude with their hemisphere letters, dB figures
 * without a negative zero, memory in MiB or GiB, and times to the minute in the user's own time zone.
 */

/** Decimal places of a shown coordinate: 1e-6° is about 0.1 m on the ground. */
const COORD_DECIMALS = 6;

/** "25.896716° S, 133.395352° E": hemisphere letters instead of signs (common practice on maps). */
export function formatLatLon(latDeg: number, lonDeg: number): string {
  const part = (v: number, pos: string, neg: string) => {
    const t = Math.abs(v).toFixed(COORD_DECIMALS);
    // A value that rounds to zero takes no hemisphere sign (0.000000° N, not S).
    return `${t}° ${v < 0 && Number(t) !== 0 ? neg : pos}`;
  };
  return `${part(latDeg, "N", "S")}, ${part(lonDeg, "E", "W")}`;
}

/** A dB figure with one decimal; "−∞" for −Infinity, "—" for NaN; −0.04 shows as 0.0, not −0.0. */
export function formatDb(v: number): string {
  if (Number.isFinite(v)) {
    const t = v.toFixed(1);
    return Number(t) === 0 ? "0.0" : t;
  }
  return v === Number.NEGATIVE_INFINITY ? "−∞" : "—";
}

/** "2026-12-03 07:45" in the browser's time zone (the zone the user reads the clock in). */
export function formatLocalMinute(at: Date): string {
  const two = (n: number) => String(n).padStart(2, "0");
  return `${at.getFullYear()}-${two(at.getMonth() + 1)}-${two(at.getDate())} ${two(at.getHours())}:${two(at.getMinutes())}`;
}

/** Memory as the run size and its refusal state it (siteGrid.ts). */
export { formatMemory } from "../io/siteGrid";

/** A number as typed into a field: its value, or why it is none. */
export type TypedNumber = { ok: true; value: number } | { ok: false; reason: string };

const PLAIN_NUMBER = /^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:e[+-]?\d+)?$/i;
const FRACTION = /^([+-]?\d+(?:\.\d+)?)\/(\d+(?:\.\d+)?)$/;
/** "1,000" or "12,500": a comma before exactly three digits could be a thousands separator. */
const THOUSANDS_LIKE = /^[+-]?\d{1,3},\d{3}$/;

/**
 * Reads a typed number: decimals with a point or a decimal comma, exponents (1e-6) and simple
 * fractions (4/3). Refused with a reason: empty text, hexadecimal or binary literals, spaces inside,
 * and a comma before exactly three digits, which may be a thousands separator ("1,000").
 */
export function parseTypedNumber(text: string): TypedNumber {
  const t = text.trim();
  if (t === "") return { ok: false, reason: "is empty" };
  const fraction = FRACTION.exec(t);
  if (fraction) {
    const v = Number(fraction[1]) / Number(fraction[2]);
    return Number.isFinite(v) ? { ok: true, value: v } : { ok: false, reason: `"${t}" divides by zero` };
  }
  if (THOUSANDS_LIKE.test(t)) {
    return {
      ok: false,
      reason: `"${t}" is ambiguous: write it without a thousands separator (use a point or a comma for decimals)`,
    };
  }
  if (!PLAIN_NUMBER.test(t)) return { ok: false, reason: `"${t}" is not a number` };
  const v = Number(t.replace(",", "."));
  return Number.isFinite(v) ? { ok: true, value: v } : { ok: false, reason: `"${t}" is not a finite number` };
}

/** An azimuth rounded to the 0.1° the panels show, in [0, 360): 359.96° is 0.0°, never 360.0°. */
export function tenthOfDegree(azDeg: number): number {
  const r = Math.round(azDeg * 10) / 10;
  return r >= 360 ? 0 : r;
}
