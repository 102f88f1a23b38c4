/**
 * Coverage figures for one target height: covered fractions of the protected area and approach ring,
 * gaps (8-connected components of gap cells), overlap histogram, and per-radar areas.
 * Areas are cell counts on the metric site grid times the cell area (cellSizeM²), never degrees.
 * On a UTM grid this is map area; true ground area differs by the square of the point scale factor
 * (within ±0.1 % inside a zone, Snyder, Map Projections — A Working Manual, USGS PP 1395, §8).
 * Cells inside an obstruction (target height below a roof or canopy) are left out of the fractions
 * and counted on their own; nodata cells likewise.
 */
import type { RadarExtent } from "./coverage.ts";
import { CellState, type FusedHeight } from "./fusion.ts";
import type { RegionMasks } from "./regionMask.ts";

export interface RegionFigures {
  /** Cells of the region. */
  cells: number;
  /** Region cells that are valid target positions (not inside an obstruction, not nodata). */
  validCells: number;
  /** Valid region cells with combined Pd ≥ the requirement. */
  coveredCells: number;
  /** coveredCells / validCells (NaN when the region has no valid cell). */
  coveredFraction: number;
  /** Region area, m². */
  areaM2: number;
  /** Covered area, m². */
  coveredAreaM2: number;
  /** Region cells inside an obstruction at this height, and their area (m²). */
  insideObstructionCells: number;
  insideObstructionAreaM2: number;
  /** Region cells with no ground data. */
  nodataCells: number;
}

export interface GapFigures {
  /** Gap components (8-connected) over the protected area and approach ring together. */
  count: number;
  /** Total gap area, m². */
  totalAreaM2: number;
  /** Area of the largest component, m² (0 when there is no gap). */
  largestAreaM2: number;
  /** Centre of the largest component in grid coordinates (x, y in m), null when no gap. */
  largestCentroidXY: [number, number] | null;
}

export interface RadarAreaFigures {
  radarId: string;
  /** Valid cells of the protected area or ring where this radar alone meets the required Pd, m². */
  coveredAreaM2: number;
  /** Of those, the area that no other radar covers (only this one), m². */
  onlyThisRadarAreaM2: number;
}

export interface HeightMetrics {
  heightAglM: number;
  protectedArea: RegionFigures;
  approachRing: RegionFigures;
  gaps: GapFigures;
  /** overlapHistogram[n] = valid cells of protected area ∪ ring met by exactly n radars. */
  overlapHistogram: number[];
  perRadar: RadarAreaFigures[];
}

export interface MetricsInput {
  heightAglM: number;
  fused: FusedHeight;
  /** Per radar, Pd per cell at this height (same order as radarIds). */
  pdPerRadar: ReadonlyArray<Float32Array>;
  radarIds: ReadonlyArray<string>;
  requiredPd: number;
  cellState: Uint8Array;
  regions: RegionMasks;
  /** Grid frame figures: size, origin (for the gap centroid) and cell size, m. */
  width: number;
  height: number;
  originX: number;
  originY: number;
  cellSizeM: number;
  /** Optional, per radar: the square outside which its Pd is 0 (RadarCoverage.extent); not read outside. */
  extents?: ReadonlyArray<RadarExtent | undefined>;
}

/** Cell counts of one region, gathered by heightMetrics' single pass over the grid. */
interface RegionCounts {
  cells: number;
  validCells: number;
  coveredCells: number;
  inside: number;
  nodata: number;
}

function regionFigures(c: RegionCounts, cellAreaM2: number): RegionFigures {
  return {
    cells: c.cells,
    validCells: c.validCells,
    coveredCells: c.coveredCells,
    coveredFraction: c.validCells > 0 ? c.coveredCells / c.validCells : Number.NaN,
    areaM2: c.cells * cellAreaM2,
    coveredAreaM2: c.coveredCells * cellAreaM2,
    insideObstructionCells: c.inside,
    insideObstructionAreaM2: c.inside * cellAreaM2,
    nodataCells: c.nodata,
  };
}

/** Adds one region cell of the given state to its counts. */
function countRegionCell(c: RegionCounts, state: number, covered: boolean): void {
  c.cells++;
  if (state === CellState.insideObstruction) c.inside++;
  else if (state === CellState.nodata) c.nodata++;
  else {
    c.validCells++;
    if (covered) c.coveredCells++;
  }
}

/**
 * Union-find parents and component numbers of gapComponents' runs, and the run ends of two rows,
 * kept between calls of one thread (a run is a maximal stretch of gap cells along a row).
 */
let scratch: {
  parent: Int32Array;
  component: Int32Array;
  rows: Int32Array[];
} | null = null;

function componentScratch(n: number, width: number): NonNullable<typeof scratch> {
  // A row of `width` cells holds at most ⌈width / 2⌉ runs (a run and a gap between runs), so a grid
  // at most rows × that; not ⌈n / 2⌉, which a narrow grid exceeds (a column of width 1: one run a row).
  const rows = width > 0 ? Math.ceil(n / width) : 0;
  const maxRuns = rows * Math.ceil(width / 2) + 1;
  const rowRuns = 3 * (Math.ceil(width / 2) + 1);
  if (scratch === null || scratch.parent.length < maxRuns || scratch.rows[0].length < rowRuns) {
    scratch = {
      parent: new Int32Array(maxRuns),
      component: new Int32Array(maxRuns),
      rows: [new Int32Array(rowRuns), new Int32Array(rowRuns)],
    };
  }
  return scratch;
}

/** Root of run r, halving the path on the way (union-find). */
function findRoot(parent: Int32Array, r: number): number {
  let x = r;
  while (parent[x] !== x) {
    parent[x] = parent[parent[x]];
    x = parent[x];
  }
  return x;
}

/**
 * Connected components (8-neighbour) of a 0/1 raster: their count, the largest size in cells and
 * the mean column/row of the largest (the first in raster order among equally large ones).
 * Runs of gap cells row by row; a run joins every run of the row above whose columns it touches,
 * diagonals included (union-find over runs, the older run as root); then one more pass sums each
 * component's cells, columns and rows (integers, so the means are exact to the last bit).
 */
export function gapComponents(
  gap: Uint8Array,
  width: number,
  height: number,
): {
  count: number;
  totalCells: number;
  largestCells: number;
  largestMeanCol: number;
  largestMeanRow: number;
} {
  const { parent, component, rows } = componentScratch(gap.length, width);
  // Pass 1: runs and their unions. rows[x] holds (first col, last col, run id) triples of one row.
  let runs = 0;
  let above = rows[0];
  let current = rows[1];
  let nAbove = 0;
  for (let row = 0; row < height; row++) {
    const start = row * width;
    let n = 0;
    let a = 0;
    for (let col = 0; col < width; col++) {
      if (gap[start + col] === 0) continue;
      const first = col;
      while (col + 1 < width && gap[start + col + 1] !== 0) col++;
      const id = runs++;
      parent[id] = id;
      current[n++] = first;
      current[n++] = col;
      current[n++] = id;
      // Runs above that end before first − 1 can touch no later run of this row either.
      while (a < nAbove && above[a + 1] < first - 1) a += 3;
      for (let b = a; b < nAbove && above[b] <= col + 1; b += 3) {
        const ra = findRoot(parent, above[b + 2]);
        const rb = findRoot(parent, id);
        if (ra < rb) parent[rb] = ra;
        else if (rb < ra) parent[ra] = rb;
      }
    }
    const t = above;
    above = current;
    current = t;
    nAbove = n;
  }
  // Pass 2: number the components by their first run (raster order) and sum their cells.
  let count = 0;
  for (let r = 0; r < runs; r++) {
    const root = findRoot(parent, r);
    component[r] = root === r ? count++ : component[root];
  }
  const size = new Float64Array(count);
  const sumCol = new Float64Array(count);
  const sumRow = new Float64Array(count);
  let run = 0;
  for (let row = 0; row < height; row++) {
    const start = row * width;
    for (let col = 0; col < width; col++) {
      if (gap[start + col] === 0) continue;
      const first = col;
      while (col + 1 < width && gap[start + col + 1] !== 0) col++;
      const c = component[run++];
      const len = col - first + 1;
      size[c] += len;
      sumCol[c] += (len * (first + col)) / 2;
      sumRow[c] += len * row;
    }
  }
  let totalCells = 0;
  let largest = -1;
  let largestCells = 0;
  for (let c = 0; c < count; c++) {
    totalCells += size[c];
    if (size[c] > largestCells) {
      largestCells = size[c];
      largest = c;
    }
  }
  return {
    count,
    totalCells,
    largestCells,
    largestMeanCol: largest < 0 ? Number.NaN : sumCol[largest] / largestCells,
    largestMeanRow: largest < 0 ? Number.NaN : sumRow[largest] / largestCells,
  };
}

/**
 * Counts over the cells of a rectangle that follow from the fused rasters alone: region figures, the
 * overlap histogram and, per radar, the cells only it covers. A cell met by exactly one radar is met by
 * its best radar (the others' Pd are below the requirement, so below its Pd), so no radar's own Pd
 * raster is read. Integers: counts of disjoint rectangles add up, and an update of one rectangle is
 * exact (fusionMemo.ts).
 */
export interface FusedCounts {
  pa: RegionCounts;
  ring: RegionCounts;
  /** histogram[n]: valid cells of protected area ∪ ring met by exactly n radars. */
  histogram: number[];
  /** only[r]: valid region cells that radar r alone meets. */
  only: number[];
}

function emptyRegionCounts(): RegionCounts {
  return { cells: 0, validCells: 0, coveredCells: 0, inside: 0, nodata: 0 };
}

/** The counts of FusedCounts over `window` (rows and columns inclusive; default the whole grid). */
export function fusedCounts(
  fused: FusedHeight,
  cellState: Uint8Array,
  regions: RegionMasks,
  requiredPd: number,
  grid: { width: number; height: number; radarCount: number },
  window?: RadarExtent,
): FusedCounts {
  const { width, height, radarCount } = grid;
  const pa = regions.protectedArea;
  const ring = regions.approachRing;
  const overlap = fused.overlapCount;
  const best = fused.bestRadar;
  const combinedPd = fused.combinedPd;
  const c: FusedCounts = {
    pa: emptyRegionCounts(),
    ring: emptyRegionCounts(),
    histogram: new Array<number>(radarCount + 1).fill(0),
    only: new Array<number>(radarCount).fill(0),
  };
  const valid = CellState.valid;
  const r0 = window ? Math.max(0, window.rowMin) : 0;
  const r1 = window ? Math.min(height - 1, window.rowMax) : height - 1;
  const c0 = window ? Math.max(0, window.colMin) : 0;
  const c1 = window ? Math.min(width - 1, window.colMax) : width - 1;
  for (let row = r0; row <= r1; row++) {
    const end = row * width + c1;
    for (let i = row * width + c0; i <= end; i++) {
      const inPa = pa[i];
      const inRing = ring[i];
      if ((inPa | inRing) === 0) continue;
      const state = cellState[i];
      const covered = combinedPd[i] >= requiredPd;
      if (inPa) countRegionCell(c.pa, state, covered);
      if (inRing) countRegionCell(c.ring, state, covered);
      if (state !== valid) continue;
      const k = overlap[i];
      c.histogram[k]++;
      if (k === 1) c.only[best[i]]++;
    }
  }
  return c;
}

/** `into` += sign × `c`, field by field. */
export function addFusedCounts(into: FusedCounts, c: FusedCounts, sign: 1 | -1): void {
  for (const [a, b] of [
    [into.pa, c.pa],
    [into.ring, c.ring],
  ] as const) {
    a.cells += sign * b.cells;
    a.validCells += sign * b.validCells;
    a.coveredCells += sign * b.coveredCells;
    a.inside += sign * b.inside;
    a.nodata += sign * b.nodata;
  }
  for (let k = 0; k < into.histogram.length; k++) into.histogram[k] += sign * c.histogram[k];
  for (let r = 0; r < into.only.length; r++) into.only[r] += sign * c.only[r];
}

/** Valid cells of the protected area or ring where one radar alone meets the required Pd. */
export function radarCoveredCells(
  pd: Float32Array,
  cellState: Uint8Array,
  regions: RegionMasks,
  requiredPd: number,
  grid: { width: number; height: number },
  extent?: RadarExtent,
): number {
  const { width, height } = grid;
  const pa = regions.protectedArea;
  const ring = regions.approachRing;
  const valid = CellState.valid;
  const r0 = extent ? Math.max(0, extent.rowMin) : 0;
  const r1 = extent ? Math.min(height - 1, extent.rowMax) : height - 1;
  const c0 = extent ? Math.max(0, extent.colMin) : 0;
  const c1 = extent ? Math.min(width - 1, extent.colMax) : width - 1;
  let n = 0;
  for (let row = r0; row <= r1; row++) {
    const end = row * width + c1;
    for (let i = row * width + c0; i <= end; i++) {
      if (pd[i] >= requiredPd && (pa[i] | ring[i]) !== 0 && cellState[i] === valid) n++;
    }
  }
  return n;
}

/** The frame figures metrics need: size, origin (for the gap centroid) and cell size, m. */
export interface MetricsGrid {
  width: number;
  height: number;
  originX: number;
  originY: number;
  cellSizeM: number;
}

/** What gapComponents finds. */
export type GapComponents = ReturnType<typeof gapComponents>;

/** A height's figures from its counts, each radar's covered cells and the gap raster's components. */
export function metricsFromCounts(
  heightAglM: number,
  counts: FusedCounts,
  coveredCells: readonly number[],
  radarIds: ReadonlyArray<string>,
  comps: GapComponents,
  grid: MetricsGrid,
): HeightMetrics {
  const { cellSizeM, originX, originY } = grid;
  const cellAreaM2 = cellSizeM * cellSizeM;
  return {
    heightAglM,
    protectedArea: regionFigures(counts.pa, cellAreaM2),
    approachRing: regionFigures(counts.ring, cellAreaM2),
    gaps: {
      count: comps.count,
      totalAreaM2: comps.totalCells * cellAreaM2,
      largestAreaM2: comps.largestCells * cellAreaM2,
      largestCentroidXY:
        comps.count > 0
          ? [
              originX + (comps.largestMeanCol + 0.5) * cellSizeM,
              originY - (comps.largestMeanRow + 0.5) * cellSizeM,
            ]
          : null,
    },
    overlapHistogram: [...counts.histogram],
    perRadar: radarIds.map((radarId, r) => ({
      radarId,
      coveredAreaM2: coveredCells[r] * cellAreaM2,
      onlyThisRadarAreaM2: counts.only[r] * cellAreaM2,
    })),
  };
}

/** All figures of one target height (see the module note for what counts where). */
export function heightMetrics(input: MetricsInput): HeightMetrics {
  const { fused, pdPerRadar, radarIds, requiredPd, cellState, regions, width, height } = input;
  const grid = { width, height, radarCount: pdPerRadar.length };
  const counts = fusedCounts(fused, cellState, regions, requiredPd, grid);
  const covered = pdPerRadar.map((pd, r) =>
    radarCoveredCells(pd, cellState, regions, requiredPd, grid, input.extents?.[r]),
  );
  const comps = gapComponents(fused.gap, width, height);
  return metricsFromCounts(input.heightAglM, counts, covered, radarIds, comps, input);
}
