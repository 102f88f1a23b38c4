/**
 * Fused heights kept between runs of one site. When only a few radars changed since the last run (a
 * post moved, retuned), the cells outside their old and new squares fuse to exactly what they did:
 * every other radar's Pd is the same there and a changed radar's is 0 outside its squares. So only
 * the rectangle those squares span is fused again, and the metrics are updated by the counts of that
 * rectangle before and after (integers: the result equals a full fusion value for value).
 */
import type { RadarCoverage, RadarExtent } from "./coverage.ts";
import { type FusedHeight, fuseHeight, mergeLowestVisibleInto } from "./fusion.ts";
import {
  addFusedCounts,
  type FusedCounts,
  fusedCounts,
  type GapComponents,
  gapComponents,
  type HeightMetrics,
  type MetricsGrid,
  metricsFromCounts,
  radarCoveredCells,
} from "./metrics.ts";
import type { RegionMasks } from "./regionMask.ts";

/** What one fusion step reads (as fuseSiteHeight gives it), with the identity of every input. */
export interface MemoFusionInput {
  /** The slice: one class at one height. */
  sliceKey: string;
  /** Identity of everything but the radars that the fusion reads: grid, terrain, height, regions, requirement. */
  context: string;
  /** Per radar, in site order, the identity of its result (equal keys: equal rasters). */
  radarKeys: readonly string[];
  pdPerRadar: readonly Float32Array[];
  /** Per radar, the square outside which its Pd is 0 (undefined: the whole grid). */
  extents: readonly (RadarExtent | undefined)[];
  radarIds: readonly string[];
  requiredPd: number;
  cellState: Uint8Array;
  regions: RegionMasks;
  heightAglM: number;
  grid: MetricsGrid;
}

export interface MemoFusionResult {
  fused: FusedHeight;
  metrics: HeightMetrics;
  /** "kept": nothing changed; "window": the rectangle of the changed radars; "full": the whole grid. */
  how: "kept" | "window" | "full";
  /** The rectangle fused again (for "window"). */
  window?: RadarExtent;
  /**
   * Identity of the slice's gap raster in this memo: the same number, the same gap cells (so its
   * components and outlines need not be found again).
   */
  gapVersion: number;
}

interface KeptSlice {
  context: string;
  radarKeys: string[];
  extents: (RadarExtent | undefined)[];
  fused: FusedHeight;
  counts: FusedCounts;
  covered: number[];
  metrics: HeightMetrics;
  comps: GapComponents;
  gapVersion: number;
}

/** The bounding rectangle of some squares, or undefined when one of them is the whole grid. */
function spanOf(squares: readonly (RadarExtent | undefined)[]): RadarExtent | undefined {
  let out: RadarExtent | null = null;
  for (const e of squares) {
    if (e === undefined) return undefined;
    // A radar with no cell of Pd > 0 adds nothing.
    if (e.rowMin > e.rowMax || e.colMin > e.colMax) continue;
    out =
      out === null
        ? { ...e }
        : {
            rowMin: Math.min(out.rowMin, e.rowMin),
            rowMax: Math.max(out.rowMax, e.rowMax),
            colMin: Math.min(out.colMin, e.colMin),
            colMax: Math.max(out.colMax, e.colMax),
          };
  }
  // Nothing changed anywhere (the changed radars reach no cell): an empty rectangle.
  return out ?? { rowMin: 0, rowMax: -1, colMin: 0, colMax: -1 };
}

function areaOf(e: RadarExtent, grid: { width: number; height: number }): number {
  const rows = Math.min(grid.height - 1, e.rowMax) - Math.max(0, e.rowMin) + 1;
  const cols = Math.min(grid.width - 1, e.colMax) - Math.max(0, e.colMin) + 1;
  return Math.max(0, rows) * Math.max(0, cols);
}

/**
 * Per slice, the last fused rasters and their counts. The returned rasters belong to the memo and are
 * overwritten by its next call for the slice: copy them to keep or send them.
 */
export class FusionMemo {
  private readonly slices = new Map<string, KeptSlice>();
  /** Gap versions are drawn from one counter, so they never repeat within a memo. */
  private gapVersions = 0;
  /** The gap cells of a window before it is fused again, row after row (reused between calls). */
  private gapBefore = new Uint8Array(0);
  /**
   * @param maxChanged more changed radars than this fuse the whole grid
   * @param maxWindowShare a rectangle over more than this share of the grid is fused whole (the two
   *   counting passes of an update would cost more than they save)
   */
  constructor(
    readonly maxChanged = 2,
    readonly maxWindowShare = 0.8,
  ) {}

  /** Cell states per height of the last terrain (they depend on the terrain and the height alone). */
  private readonly states = new Map<number, Uint8Array>();
  private statesTerrain = "";

  get size(): number {
    return this.slices.size;
  }

  clear(): void {
    this.slices.clear();
    this.states.clear();
    this.keptLowest = null;
  }

  /** The cell states of `terrainId` at a height: kept, or computed by `compute` and kept. */
  cellStates(terrainId: string, heightAglM: number, compute: () => Uint8Array): Uint8Array {
    if (terrainId !== this.statesTerrain) {
      this.states.clear();
      this.statesTerrain = terrainId;
    }
    let s = this.states.get(heightAglM);
    if (s === undefined) {
      s = compute();
      this.states.set(heightAglM, s);
    }
    return s;
  }

  fuse(input: MemoFusionInput): MemoFusionResult {
    const { pdPerRadar, extents, requiredPd, cellState, regions, grid } = input;
    const n = grid.width * grid.height;
    const counting = { width: grid.width, height: grid.height, radarCount: pdPerRadar.length };
    const kept = this.slices.get(input.sliceKey);
    const comparable =
      kept !== undefined &&
      kept.context === input.context &&
      kept.radarKeys.length === input.radarKeys.length &&
      kept.metrics.perRadar.every((p, r) => p.radarId === input.radarIds[r]) &&
      kept.fused.combinedPd.length === n;
    const changed: number[] = [];
    if (comparable)
      for (let r = 0; r < input.radarKeys.length; r++)
        if (kept.radarKeys[r] !== input.radarKeys[r]) changed.push(r);
    if (comparable && changed.length === 0)
      return { fused: kept.fused, metrics: kept.metrics, how: "kept", gapVersion: kept.gapVersion };
    let window: RadarExtent | undefined;
    if (comparable && changed.length <= this.maxChanged) {
      window = spanOf(changed.flatMap((r) => [kept.extents[r], extents[r]]));
      if (window !== undefined && areaOf(window, grid) > this.maxWindowShare * n) window = undefined;
    }
    const fusion = { pdPerRadar, requiredPd, cellState, regions, extents, width: grid.width };
    let fused: FusedHeight;
    let counts: FusedCounts;
    let covered: number[];
    let comps: GapComponents | null = null;
    let gapVersion: number;
    if (comparable && window !== undefined) {
      // The rectangle's counts leave with its old values and come back with the new ones.
      ({ fused, counts, covered } = kept);
      addFusedCounts(counts, fusedCounts(fused, cellState, regions, requiredPd, counting, window), -1);
      const before = this.copyGaps(fused.gap, grid.width, window);
      fuseHeight({ ...fusion, out: fused, window });
      addFusedCounts(counts, fusedCounts(fused, cellState, regions, requiredPd, counting, window), 1);
      for (const r of changed)
        covered[r] = radarCoveredCells(pdPerRadar[r], cellState, regions, requiredPd, grid, extents[r]);
      // Gap cells change only inside the rectangle: unchanged there, the components are the same.
      if (sameGaps(before, fused.gap, grid.width, window)) {
        comps = kept.comps;
        gapVersion = kept.gapVersion;
      } else gapVersion = ++this.gapVersions;
    } else {
      const out = kept !== undefined && kept.fused.combinedPd.length === n ? kept.fused : undefined;
      fused = fuseHeight({ ...fusion, out });
      counts = fusedCounts(fused, cellState, regions, requiredPd, counting);
      covered = pdPerRadar.map((pd, r) =>
        radarCoveredCells(pd, cellState, regions, requiredPd, grid, extents[r]),
      );
      gapVersion = ++this.gapVersions;
    }
    comps ??= gapComponents(fused.gap, grid.width, grid.height);
    const metrics = metricsFromCounts(input.heightAglM, counts, covered, input.radarIds, comps, grid);
    const entry: KeptSlice = {
      context: input.context,
      radarKeys: [...input.radarKeys],
      extents: extents.map((e) => (e === undefined ? undefined : { ...e })),
      fused,
      counts,
      covered,
      metrics,
      comps,
      gapVersion,
    };
    this.slices.set(input.sliceKey, entry);
    return window !== undefined
      ? { fused, metrics, how: "window", window, gapVersion }
      : { fused, metrics, how: "full", gapVersion };
  }

  /** The lowest visible height last merged, with what it was merged from. */
  private keptLowest: {
    context: string;
    radarKeys: string[];
    extents: (RadarExtent | undefined)[];
    lowest: Float32Array;
  } | null = null;

  /**
   * The lowest visible height over `radars` (mergeLowestVisibleInto), merged again only inside the
   * squares of the radars that changed since the last call of the same terrain. The array belongs to
   * the memo, like the fused rasters.
   */
  lowest(
    terrainId: string,
    frame: { width: number; height: number },
    radars: readonly RadarCoverage[],
    radarKeys: readonly string[],
  ): Float32Array {
    const n = frame.width * frame.height;
    const kept = this.keptLowest;
    const extents = radars.map((r) => r.extent);
    let window: RadarExtent | undefined;
    let full = true;
    if (
      kept !== null &&
      kept.context === terrainId &&
      kept.lowest.length === n &&
      kept.radarKeys.length === radarKeys.length
    ) {
      const changed: number[] = [];
      for (let r = 0; r < radarKeys.length; r++) if (kept.radarKeys[r] !== radarKeys[r]) changed.push(r);
      if (changed.length === 0) return kept.lowest;
      if (changed.length <= this.maxChanged) {
        window = spanOf(changed.flatMap((r) => [kept.extents[r], extents[r]]));
        full = window === undefined || areaOf(window, frame) > this.maxWindowShare * n;
      }
    }
    const lowest = kept !== null && kept.lowest.length === n ? kept.lowest : new Float32Array(n);
    mergeLowestVisibleInto(lowest, frame, radars, full ? undefined : window);
    this.keptLowest = {
      context: terrainId,
      radarKeys: [...radarKeys],
      extents: extents.map((e) => (e === undefined ? undefined : { ...e })),
      lowest,
    };
    return lowest;
  }

  /** The gap cells of `window`, row after row, into the memo's scratch (valid until the next call). */
  private copyGaps(gap: Uint8Array, width: number, window: RadarExtent): Uint8Array {
    const rows = window.rowMax - window.rowMin + 1;
    const cols = window.colMax - window.colMin + 1;
    if (rows <= 0 || cols <= 0) return this.gapBefore.subarray(0, 0);
    if (this.gapBefore.length < rows * cols) this.gapBefore = new Uint8Array(rows * cols);
    for (let r = 0; r < rows; r++) {
      const start = (window.rowMin + r) * width + window.colMin;
      this.gapBefore.set(gap.subarray(start, start + cols), r * cols);
    }
    return this.gapBefore.subarray(0, rows * cols);
  }
}

/** Whether `gap` holds in `window` what `before` (copyGaps of the same window) held. */
function sameGaps(before: Uint8Array, gap: Uint8Array, width: number, window: RadarExtent): boolean {
  if (before.length === 0) return true;
  const cols = window.colMax - window.colMin + 1;
  for (let r = 0, k = 0; k < before.length; r++) {
    const start = (window.rowMin + r) * width + window.colMin;
    for (let c = 0; c < cols; c++, k++) if (before[k] !== gap[start + c]) return false;
  }
  return true;
}
