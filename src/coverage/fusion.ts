/**
 * Fusion of several radars at one target height: combined detection probability, overlap count,
 * best radar, and the gap mask over the protected area and approach ring.
 *
 * Combined Pd = 1 − Π(1 − Pd_i): the radars decide independently and a detection by any one counts
 * (the OR rule for independent sensors; common practice, e.g. Skolnik, Radar Handbook 3rd ed., on
 * netted radars). Overlap = the number of radars that alone meet the required Pd.
 */
import type { RadarExtent } from "./coverage.ts";
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
  const combinedPd = fits ? reuse.combinedPd : new Float32Array(n);
  const overlapCount = fits ? reuse.overlapCount : new Uint8Array(n);
  const bestRadar = fits ? reuse.bestRadar : new Uint8Array(n);
  const gap = fits ? reuse.gap : new Uint8Array(n);
  const protectedArea = regions.protectedArea;
  const ring = regions.approachRing;
  const width = input.width !== undefined && input.width > 0 ? input.width : n;
  const rows = width > 0 ? Math.ceil(n / width) : 0;
  // Per row, radar by radar in index order over the columns its square covers (so the product
  // below is formed in the same order as over all radars), into row accumulators; then the row's
  // outputs. Each Pd raster is read once, along rows, with no per-cell test of its square.
  const miss = new Float64Array(width);
  const count = new Uint8Array(width);
  const best = new Uint8Array(width);
  const bestPd = new Float32Array(width);
  const rasters = pdPerRadar.slice();
  for (let row = 0; row < rows; row++) {
    const start = row * width;
    const end = Math.min(n, start + width);
    miss.fill(1);
    count.fill(0);
    best.fill(NO_RADAR);
    bestPd.fill(0);
    for (let r = 0; r < radarCount; r++) {
      const e = extents?.[r];
      let lo = 0;
      let hi = end - start - 1;
      if (e !== undefined) {
        if (row < e.rowMin || row > e.rowMax) continue;
        lo = e.colMin;
        hi = Math.min(hi, e.colMax);
      }
      accumulateRadarRow(rasters[r], r, start, lo, hi, requiredPd, miss, count, best, bestPd);
    }
    for (let i = start; i < end; i++) {
      const col = i - start;
      if (cellState[i] !== CellState.valid) {
        combinedPd[i] = 0;
        overlapCount[i] = 0;
        bestRadar[i] = NO_RADAR;
        gap[i] = 0;
        continue;
      }
      const pdc = 1 - miss[col];
      combinedPd[i] = pdc;
      overlapCount[i] = count[col];
      bestRadar[i] = best[col];
      gap[i] = (protectedArea[i] | ring[i]) !== 0 && pdc < requiredPd ? 1 : 0;
    }
  }
  return { combinedPd, overlapCount, bestRadar, gap };
}

/** One radar's Pd over columns lo..hi of one row into the row accumulators of fuseHeight. */
function accumulateRadarRow(
  pd: Float32Array,
  radar: number,
  start: number,
  lo: number,
  hi: number,
  requiredPd: number,
  miss: Float64Array,
  count: Uint8Array,
  best: Uint8Array,
  bestPd: Float32Array,
): void {
  for (let col = lo; col <= hi; col++) {
    const p = pd[start + col];
    if (!(p > 0)) continue;
    miss[col] *= 1 - p;
    if (p >= requiredPd) count[col]++;
    if (p > bestPd[col]) {
      bestPd[col] = p;
      best[col] = radar;
    }
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
