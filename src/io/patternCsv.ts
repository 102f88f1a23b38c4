/**
 * Measured antenna pattern cuts from CSV: one row per angle, angle off boresight in degrees and gain
 * in dB. The result is a PatternCut (src/coverage/radarModel.ts) that antennaPattern.ts interpolates.
 *
 * Accepted: a header row or none; comma, semicolon or tab separators; decimal commas when the
 * separator is not a comma; angles in [-180, 180] in any order (sorted here); gains relative to peak
 * (≤ 0 dB) or absolute (dBi), which are normalised to the peak with a warning. Errors name the row
 * (1-based, as a spreadsheet shows it) and the column.
 */
import Papa from "papaparse";
import type { PatternCut } from "../coverage/radarModel.ts";

export type PatternCsvResult =
  | { ok: true; cut: PatternCut; warnings: string[] }
  | { ok: false; errors: string[] };

/** Most rows read from one cut file; a measured cut at 0.1° steps over 360° has 3601. */
export const MAX_PATTERN_ROWS = 100_000;

function toNumber(text: string, decimalComma: boolean): number {
  const t = text.trim();
  if (t === "") return Number.NaN;
  return Number(decimalComma ? t.replace(",", ".") : t);
}

/** Parse the text of a pattern-cut CSV file named `fileName` (used in messages). Never throws. */
export function parsePatternCsv(text: string, fileName: string): PatternCsvResult {
  // A semicolon or tab anywhere means that is the separator (and commas are decimal commas).
  const delimiter = text.includes(";") ? ";" : text.includes("\t") ? "\t" : ",";
  const parsed = Papa.parse<string[]>(text.trim(), { skipEmptyLines: "greedy", delimiter });
  const rows = parsed.data;
  if (rows.length === 0) return { ok: false, errors: [`${fileName}: the file has no rows`] };
  if (rows.length > MAX_PATTERN_ROWS) {
    return {
      ok: false,
      errors: [`${fileName}: ${rows.length} rows is more than the ${MAX_PATTERN_ROWS} allowed`],
    };
  }
  const decimalComma = delimiter !== ",";
  const header = rows[0].some((cell) => Number.isNaN(toNumber(cell, decimalComma)));
  const first = header ? 1 : 0;
  const columns = header ? rows[0].map((c) => c.trim()) : ["angle (deg)", "gain (dB)"];
  const errors: string[] = [];
  const points: { angleDeg: number; gainDb: number }[] = [];
  for (let r = first; r < rows.length; r++) {
    const row = rows[r];
    const where = `${fileName}: row ${r + 1}`;
    if (row.length < 2) {
      errors.push(`${where}: expected two columns (angle in degrees, gain in dB), found ${row.length}`);
      continue;
    }
    const angleDeg = toNumber(row[0], decimalComma);
    const gainDb = toNumber(row[1], decimalComma);
    if (!Number.isFinite(angleDeg))
      errors.push(`${where}, column "${columns[0]}": "${row[0]}" is not a number`);
    else if (angleDeg < -180 || angleDeg > 180)
      errors.push(`${where}, column "${columns[0]}": ${angleDeg}° lies outside −180° to 180°`);
    if (!Number.isFinite(gainDb))
      errors.push(`${where}, column "${columns[1]}": "${row[1]}" is not a number`);
    else if (gainDb < -200 || gainDb > 80)
      errors.push(`${where}, column "${columns[1]}": ${gainDb} dB lies outside −200 dB to 80 dB`);
    if (Number.isFinite(angleDeg) && Number.isFinite(gainDb)) points.push({ angleDeg, gainDb });
  }
  if (errors.length > 0) return { ok: false, errors };
  if (points.length < 2) return { ok: false, errors: [`${fileName}: a cut needs at least two angles`] };
  points.sort((a, b) => a.angleDeg - b.angleDeg);
  for (let i = 1; i < points.length; i++) {
    if (points[i].angleDeg === points[i - 1].angleDeg) {
      return { ok: false, errors: [`${fileName}: the angle ${points[i].angleDeg}° appears twice`] };
    }
  }
  const warnings: string[] = [];
  const peakDb = Math.max(...points.map((p) => p.gainDb));
  if (peakDb !== 0) {
    warnings.push(
      `${fileName}: gains were normalised to the cut's peak (${peakDb.toFixed(2)} dB); the antenna's peak gain stays as set in the radar model`,
    );
  }
  return {
    ok: true,
    cut: { angleDeg: points.map((p) => p.angleDeg), relativeGainDb: points.map((p) => p.gainDb - peakDb) },
    warnings,
  };
}
