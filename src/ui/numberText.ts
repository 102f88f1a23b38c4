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
