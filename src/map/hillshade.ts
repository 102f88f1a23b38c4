/**
 * Hillshade of the ground grid for the offline basemap: the usual cartographic analytic shading
 * (Horn's 3×3 slope and aspect, light from the north-west at 45° elevation), as a grey byte per cell.
 */
import type { Grid } from "../coverage/grid";
import { degToRad } from "../coverage/units";
import { TABLE_SIZE } from "./colourTable";

/** Cartographic convention: light from azimuth 315° (north-west). */
export const SUN_AZIMUTH_DEG = 315;
/** Cartographic convention: light 45° above the horizon. */
export const SUN_ELEVATION_DEG = 45;
/** Vertical exaggeration so gentle relief still reads at site scale. */
export const RELIEF_EXAGGERATION = 2;

/** Per cell a shade byte 0 (dark) … 255 (lit), or -1 where the ground is nodata. */
export function hillshadeIndices(ground: Grid): Int16Array {
  const out = new Int16Array(ground.width * ground.height);
  hillshadeRows(ground, out, 0, ground.height);
  return out;
}

/** Rows below this many milliseconds of work go in one slice of hillshadeIndicesInSlices. */
const SLICE_BUDGET_MS = 12;

/**
 * hillshadeIndices in slices of rows of about SLICE_BUDGET_MS each, yielding to the page between
 * them, so that a large grid never blocks the map; resolves to null when `cancelled()` turns true.
 */
export async function hillshadeIndicesInSlices(
  ground: Grid,
  cancelled: () => boolean,
): Promise<Int16Array | null> {
  const out = new Int16Array(ground.width * ground.height);
  let rowsPerSlice = 16;
  for (let r = 0; r < ground.height; ) {
    if (cancelled()) return null;
    const t0 = performance.now();
    const end = Math.min(ground.height, r + rowsPerSlice);
    hillshadeRows(ground, out, r, end);
    const ms = performance.now() - t0;
    // Aim the next slice at the budget from the pace of this one (at least one row).
    rowsPerSlice = Math.max(1, Math.round(((end - r) * SLICE_BUDGET_MS) / Math.max(ms, 0.1)));
    r = end;
    await new Promise((resolve) => setTimeout(resolve, 0));
  }
  return cancelled() ? null : out;
}

/** Shades rows rowFrom…rowTo−1 of `ground` into `out` (see hillshadeIndices). */
function hillshadeRows(ground: Grid, out: Int16Array, rowFrom: number, rowTo: number): void {
  const { width: w, height: h, data, cellSizeM } = ground;
  const zen = degToRad(90 - SUN_ELEVATION_DEG);
  const az = degToRad(360 - SUN_AZIMUTH_DEG + 90);
  const cosZen = Math.cos(zen);
  const sinZen = Math.sin(zen);
  const at = (c: number, r: number): number => {
    const cc = c < 0 ? 0 : c >= w ? w - 1 : c;
    const rr = r < 0 ? 0 : r >= h ? h - 1 : r;
    const v = data[rr * w + cc];
    return Number.isNaN(v) ? data[r * w + c] : v;
  };
  for (let r = rowFrom; r < rowTo; r++) {
    for (let c = 0; c < w; c++) {
      const centre = data[r * w + c];
      if (Number.isNaN(centre)) {
        out[r * w + c] = -1;
        continue;
      }
      const a = at(c - 1, r - 1);
      const b = at(c, r - 1);
      const cc = at(c + 1, r - 1);
      const d = at(c - 1, r);
      const f = at(c + 1, r);
      const g = at(c - 1, r + 1);
      const hh = at(c, r + 1);
      const i = at(c + 1, r + 1);
      const dzdx = ((cc + 2 * f + i - (a + 2 * d + g)) / (8 * cellSizeM)) * RELIEF_EXAGGERATION;
      const dzdy = ((g + 2 * hh + i - (a + 2 * b + cc)) / (8 * cellSizeM)) * RELIEF_EXAGGERATION;
      const slope = Math.atan(Math.hypot(dzdx, dzdy));
      const aspect = Math.atan2(dzdy, -dzdx);
      const shade = cosZen * Math.cos(slope) + sinZen * Math.sin(slope) * Math.cos(az - aspect);
      const v = Math.round(Math.max(0, Math.min(1, shade)) * (TABLE_SIZE - 1));
      out[r * w + c] = Number.isFinite(v) ? v : -1;
    }
  }
}

/** A grey ramp table with a warm paper tint, for the hillshade. */
export function greyTable(): Uint8ClampedArray {
  const t = new Uint8ClampedArray(TABLE_SIZE * 4);
  for (let i = 0; i < TABLE_SIZE; i++) {
    const v = 90 + Math.round((i / (TABLE_SIZE - 1)) * 160);
    t[i * 4] = v + 4;
    t[i * 4 + 1] = v + 2;
    t[i * 4 + 2] = v;
    t[i * 4 + 3] = 255;
  }
  return t;
}
