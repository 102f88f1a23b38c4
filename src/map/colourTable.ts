/**
 * Colour tables for raster layers: 256 RGBA entries sampled once from a perceptually uniform,
 * colour-blind-safe ramp (d3-scale-chromatic cividis or viridis). Layers index the table with a byte,
 * so no colour is computed per pixel.
 */
import { interpolateCividis, interpolateViridis } from "d3-scale-chromatic";

export type RampName = "cividis" | "viridis";

/** Number of entries in every colour table. */
export const TABLE_SIZE = 256;

/** A colour table: TABLE_SIZE × RGBA bytes. */
export type ColourTable = Uint8ClampedArray;

const RAMPS: Record<RampName, (t: number) => string> = {
  cividis: interpolateCividis,
  viridis: interpolateViridis,
};

/** Parses "rgb(r, g, b)" or "#rrggbb" as returned by d3-scale-chromatic. */
export function parseCssColour(css: string): [number, number, number] {
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(css);
  if (hex) return [Number.parseInt(hex[1], 16), Number.parseInt(hex[2], 16), Number.parseInt(hex[3], 16)];
  const rgb = /^rgb\(\s*(\d+)\s*,\s*(\d+)\s*,\s*(\d+)\s*\)$/.exec(css);
  if (rgb) return [Number(rgb[1]), Number(rgb[2]), Number(rgb[3])];
  throw new Error(`unknown colour "${css}"`);
}

/** Builds a 256-entry table from a ramp; entry i holds the ramp at t = i / 255, alpha `alpha` (0–255). */
export function buildColourTable(ramp: RampName, alpha = 255): ColourTable {
  const table = new Uint8ClampedArray(TABLE_SIZE * 4);
  const interpolate = RAMPS[ramp];
  for (let i = 0; i < TABLE_SIZE; i++) {
    const [r, g, b] = parseCssColour(interpolate(i / (TABLE_SIZE - 1)));
    table[i * 4] = r;
    table[i * 4 + 1] = g;
    table[i * 4 + 2] = b;
    table[i * 4 + 3] = alpha;
  }
  return table;
}

/** A table of `count` evenly spaced ramp colours for small integer classes (e.g. overlap 0…N). */
export function buildClassTable(ramp: RampName, count: number, alpha = 255): ColourTable {
  const table = new Uint8ClampedArray(TABLE_SIZE * 4);
  const interpolate = RAMPS[ramp];
  for (let i = 0; i < TABLE_SIZE; i++) {
    const k = Math.min(i, count - 1);
    const t = count > 1 ? k / (count - 1) : 1;
    const [r, g, b] = parseCssColour(interpolate(t));
    table[i * 4] = r;
    table[i * 4 + 1] = g;
    table[i * 4 + 2] = b;
    table[i * 4 + 3] = alpha;
  }
  return table;
}

/** The linear scale of a continuous layer: value `minValue` maps to entry 0, `maxValue` to entry 255. */
export interface ValueScale {
  minValue: number;
  maxValue: number;
}

/**
 * Table index of a value: 0…255 clamped, or -1 for NaN (drawn transparent).
 * A degenerate scale (max ≤ min) maps every finite value to 255.
 */
export function tableIndex(value: number, scale: ValueScale): number {
  if (Number.isNaN(value)) return -1;
  const span = scale.maxValue - scale.minValue;
  if (!(span > 0)) return TABLE_SIZE - 1;
  const t = (value - scale.minValue) / span;
  if (t <= 0) return 0;
  if (t >= 1) return TABLE_SIZE - 1;
  return Math.round(t * (TABLE_SIZE - 1));
}

/** CSS colour of a table entry, for legends. */
export function tableCss(table: ColourTable, index: number): string {
  const i = Math.max(0, Math.min(TABLE_SIZE - 1, Math.round(index))) * 4;
  return `rgb(${table[i]}, ${table[i + 1]}, ${table[i + 2]})`;
}
