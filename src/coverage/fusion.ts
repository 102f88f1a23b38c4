/**
 * Fusion of several radars at one target height: combined detection probability, overlap count,
 * best radar, and the gap mask over the protected area and approach ring.
 *
 * Combined Pd = 1 − Π(1 − Pd_i): the radars decide independently and a detection by any one counts
 * (the OR rule for independent sensors; common practice, e.g. Skolnik, Radar Handbook 3rd ed., on
 * netted radars). Overlap = the number of radars that alone meet the required Pd.
 */
import type { RadarCoverage, RadarExtent } from "./coverage.ts";
import type { RegionMasks } from "./regionMask.ts";

/** "No radar" in a best-radar raster. */
export const NO_RADAR = 255;

/** State of a cell in a fused raster (one height), for the gap mask and the metrics. */
export const CellState = {
  /** A valid target position: the requirement applies. */
  valid: 0,
  /** The target height is below a roof or canopy here: no valid position, left out of fractions. */
  insideObstruction: 1,
  /** No ground elevation here: never covered, never counted. */
  nodata: 2,
} as const;
export type CellState = (typeof CellState)[keyof typeof CellState];

export interface FusionInput {
  /** Per radar, Pd per cell at this height (NaN counts as 0). All the same length. */
  pdPerRadar: ReadonlyArray<Float32Array>;
  /** Required Pd in (0, 1). */
  requiredPd: number;
  /** Per cell state at this height (see CellState). */
  cellState: Uint8Array;
  /** Region masks; gaps are only marked inside them. */
  regions: RegionMasks;
  /**
   * Optional, per radar: the square outside which its Pd is 0 (RadarCoverage.extent; undefined = the
   * whole grid). The radar's raster is not read outside it. Needs `width`.
   */
  extents?: ReadonlyArray<RadarExtent | undefined>;
  /** Columns of the grid, for `extents` (cells are row-major). */
  width?: number;
  /** Optional arrays of a previous FusedHeight of the same length to overwrite instead of allocating. */
  out?: FusedHeight;
  /**
   * Optional: fuse only the cells of this rectangle (rows and columns inclusive) and keep the rest of
   * `out` (which is then required): an update after some radars changed, all of whose old and new
   * squares lie inside it (fusionMemo.ts). Needs `width`.
   */
  window?: RadarExtent;
}

export interface FusedHeight {
  /** Combined Pd, 0 where the cell is not valid. */
  combinedPd: Float32Array;
  /** Radars meeting the required Pd on their own (0 where not valid). */
  overlapCount: Uint8Array;
  /** Index of the radar with the highest Pd (NO_RADAR where none has Pd > 0 or not valid). */
  bestRadar: Uint8Array;
  /** 1 where a valid cell of the protected area or approach ring has combined Pd below the requirement. */
  gap: Uint8Array;
}

/**
 * Fuse the radars' Pd rasters of one height. At most 254 radars (best-radar indices are bytes).
 * A cell that is not valid (inside an obstruction, nodata) gets combined Pd 0, overlap 0 and no gap.
 */
export function fuseHeight(input: FusionInput): FusedHeight {
  const { pdPerRadar, requiredPd, cellState, regions, extents } = input;
  const n = cellState.length;
  const radarCount = pdPerRadar.length;
  if (radarCount >= NO_RADAR)
    throw new RangeError(`fusion takes at most ${NO_RADAR - 1} radars, got ${radarCount}`);
  const reuse = input.out;
  const fits =
    reuse !== undefined &&
    reuse.combinedPd.length === n &&
    reuse.overlapCount.length === n &&
    reuse.bestRadar.length === n &&
    reuse.gap.length === n;
  const win = input.window;
  if (win !== undefined && !fits)
    throw new RangeError("a fusion window needs the previous fused arrays of the same length (out)");
  const combinedPd = fits ? reuse.combinedPd : new Float32Array(n);
  const overlapCount = fits ? reuse.overlapCount : new Uint8Array(n);
  const bestRadar = fits ? reuse.bestRadar : new Uint8Array(n);
  const gap = fits ? reuse.gap : new Uint8Array(n);
  const width = input.width !== undefined && input.width > 0 ? input.width : n;
  const rows = width > 0 ? Math.ceil(n / width) : 0;
  // Per row, radar by radar in index order over the columns its square covers (so the product
  // below is formed in the same order as over all radars), into row accumulators; then the row's
  // outputs. Each Pd raster is read once, along rows, with no per-cell test of its square.
  const rasters = pdPerRadar.slice();
  const lo = new Int32Array(radarCount);
  const hi = new Int32Array(radarCount);
  const ids = new Int32Array(radarCount);
  const list = new Int32Array(radarCount);
  const cuts = new Int32Array(2 * radarCount + 2);
  const out: FusedHeight = { combinedPd, overlapCount, bestRadar, gap };
  const rowFrom = win === undefined ? 0 : Math.max(0, win.rowMin);
  const rowTo = win === undefined ? rows - 1 : Math.min(rows - 1, win.rowMax);
  for (let row = rowFrom; row <= rowTo; row++) {
    const start = row * width;
    const end = Math.min(n, start + width);
    const first = win === undefined ? 0 : Math.max(0, win.colMin);
    const last = win === undefined ? end - start - 1 : Math.min(end - start - 1, win.colMax);
    if (last < first) continue;
    // The radars whose square reaches this row, in index order, and their column spans.
    let na = 0;
    let nc = 0;
    cuts[nc++] = first;
    cuts[nc++] = last + 1;
    for (let r = 0; r < radarCount; r++) {
      const e = extents?.[r];
      if (e !== undefined && (row < e.rowMin || row > e.rowMax)) continue;
      ids[na] = r;
      lo[na] = e === undefined ? first : Math.max(first, e.colMin);
      hi[na] = e === undefined ? last : Math.min(last, e.colMax);
      if (lo[na] > hi[na]) continue;
      cuts[nc++] = lo[na];
      cuts[nc++] = hi[na] + 1;
      na++;
    }
    // Segments of the row over which the same radars are active: no per-cell test of the squares.
    const sorted = cuts.subarray(0, nc).sort();
    for (let s = 0; s + 1 < nc; s++) {
      const x0 = sorted[s];
      const x1 = sorted[s + 1];
      if (x1 <= x0) continue;
      let k = 0;
      for (let a = 0; a < na; a++) if (lo[a] <= x0 && hi[a] >= x1 - 1) list[k++] = ids[a];
      if (k === 3) fuseSegment3(rasters, list, start + x0, start + x1, requiredPd, cellState, regions, out);
      else fuseSegment(rasters, list, k, start + x0, start + x1, requiredPd, cellState, regions, out);
    }
  }
  return { combinedPd, overlapCount, bestRadar, gap };
}

/**
 * Cells [from, to) of one row, the radars of `list` (k of them, index order) active over all of them:
 * combined Pd as 1 − Π(1 − Pd) in that order, overlap, best radar, gap. Twin of fuseSegment3.
 */
function fuseSegment(
  rasters: ReadonlyArray<Float32Array>,
  list: Int32Array,
  k: number,
  from: number,
  to: number,
  requiredPd: number,
  cellState: Uint8Array,
  regions: RegionMasks,
  out: FusedHeight,
): void {
  const { combinedPd, overlapCount, bestRadar, gap } = out;
  const protectedArea = regions.protectedArea;
  const ring = regions.approachRing;
  const valid = CellState.valid;
  const none = NO_RADAR;
  for (let i = from; i < to; i++) {
    if (cellState[i] !== valid) {
      combinedPd[i] = 0;
      overlapCount[i] = 0;
      bestRadar[i] = none;
      gap[i] = 0;
      continue;
    }
    let miss = 1;
    let count = 0;
    let best = none;
    let bestPd = 0;
    for (let a = 0; a < k; a++) {
      const r = list[a];
      const p = rasters[r][i];
      if (!(p > 0)) continue;
      miss *= 1 - p;
      if (p >= requiredPd) count++;
      if (p > bestPd) {
        bestPd = p;
        best = r;
      }
    }
    const pdc = 1 - miss;
    combinedPd[i] = pdc;
    overlapCount[i] = count;
    bestRadar[i] = best;
    gap[i] = (protectedArea[i] | ring[i]) !== 0 && pdc < requiredPd ? 1 : 0;
  }
}

/** fuseSegment for exactly three radars, their rasters in locals (the common case over wide areas). */
function fuseSegment3(
  rasters: ReadonlyArray<Float32Array>,
  list: Int32Array,
  from: number,
  to: number,
  requiredPd: number,
  cellState: Uint8Array,
  regions: RegionMasks,
  out: FusedHeight,
): void {
  const { combinedPd, overlapCount, bestRadar, gap } = out;
  const protectedArea = regions.protectedArea;
  const ring = regions.approachRing;
  const valid = CellState.valid;
  const none = NO_RADAR;
  const ra = list[0];
  const rb = list[1];
  const rc = list[2];
  const pa = rasters[ra];
  const pb = rasters[rb];
  const pc = rasters[rc];
  for (let i = from; i < to; i++) {
    if (cellState[i] !== valid) {
      combinedPd[i] = 0;
      overlapCount[i] = 0;
      bestRadar[i] = none;
      gap[i] = 0;
      continue;
    }
    let miss = 1;
    let count = 0;
    let best = none;
    let bestPd = 0;
    const p0 = pa[i];
    if (p0 > 0) {
      miss *= 1 - p0;
      if (p0 >= requiredPd) count++;
      bestPd = p0;
      best = ra;
    }
    const p1 = pb[i];
    if (p1 > 0) {
      miss *= 1 - p1;
      if (p1 >= requiredPd) count++;
      if (p1 > bestPd) {
        bestPd = p1;
        best = rb;
      }
    }
    const p2 = pc[i];
    if (p2 > 0) {
      miss *= 1 - p2;
      if (p2 >= requiredPd) count++;
      if (p2 > bestPd) {
        bestPd = p2;
        best = rc;
      }
    }
    const pdc = 1 - miss;
    combinedPd[i] = pdc;
    overlapCount[i] = count;
    bestRadar[i] = best;
    gap[i] = (protectedArea[i] | ring[i]) !== 0 && pdc < requiredPd ? 1 : 0;
  }
}

/**
 * The state of every cell at one target height: nodata where the ground is NaN, inside an obstruction
 * where the target height AGL is below the roof or canopy top (obstructionTopAglM > heightAglM), else valid.
 */
export function cellStatesAtHeight(
  ground: Float32Array,
  obstructionTopAglM: Float32Array,
  heightAglM: number,
  out?: Uint8Array,
): Uint8Array {
  const n = ground.length;
  const state = out ?? new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const g = ground[i];
    if (Number.isNaN(g)) state[i] = CellState.nodata;
    else if (obstructionTopAglM[i] > heightAglM) state[i] = CellState.insideObstruction;
    else state[i] = CellState.valid;
  }
  return state;
}

/**
 * The lowest visible height over `radars` into `lowest`, in `window` only (rows and columns
 * inclusive; default the whole grid): NaN first, then each radar's inside its square.
 */
export function mergeLowestVisibleInto(
  lowest: Float32Array,
  frame: { width: number; height: number },
  radars: readonly RadarCoverage[],
  window?: RadarExtent,
): void {
  const w = frame.width;
  const wr0 = window ? Math.max(0, window.rowMin) : 0;
  const wr1 = window ? Math.min(frame.height - 1, window.rowMax) : frame.height - 1;
  const wc0 = window ? Math.max(0, window.colMin) : 0;
  const wc1 = window ? Math.min(w - 1, window.colMax) : w - 1;
  if (wr1 < wr0 || wc1 < wc0) return;
  for (let row = wr0; row <= wr1; row++) lowest.fill(Number.NaN, row * w + wc0, row * w + wc1 + 1);
  for (const r of radars) {
    const l = r.lowestVisibleHeightAglM;
    // Outside its extent a radar's lowest height is NaN, which changes nothing here.
    const e = r.extent;
    const r0 = Math.max(wr0, e ? e.rowMin : 0);
    const r1 = Math.min(wr1, e ? e.rowMax : frame.height - 1);
    const c0 = Math.max(wc0, e ? e.colMin : 0);
    const c1 = Math.min(wc1, e ? e.colMax : w - 1);
    for (let row = r0; row <= r1; row++) {
      const end = row * w + c1;
      for (let i = row * w + c0; i <= end; i++) {
        const v = l[i];
        // v < lowest, or lowest NaN, for a v that is not NaN.
        if (!Number.isNaN(v) && !(v >= lowest[i])) lowest[i] = v;
      }
    }
  }
}
