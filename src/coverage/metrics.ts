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
 * Visited flags and stack of gapComponents, kept between calls of one thread (flags cleared each
 * call). Bytes, not labels: only "already in a component" is ever asked.
 */
let scratch: { label: Uint8Array; stack: Int32Array } | null = null;

function componentScratch(n: number): { label: Uint8Array; stack: Int32Array } {
  if (scratch === null || scratch.label.length !== n) {
    scratch = { label: new Uint8Array(n), stack: new Int32Array(n) };
  } else scratch.label.fill(0);
  return scratch;
}

/**
 * Connected components (8-neighbour) of a 0/1 raster: their count, the largest size in cells and
 * the mean column/row of the largest. Flood fill with an explicit stack (no recursion).
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
  const { label, stack } = componentScratch(gap.length);
  let count = 0;
  let totalCells = 0;
  let largestCells = 0;
  let largestMeanCol = Number.NaN;
  let largestMeanRow = Number.NaN;
  for (let start = 0; start < gap.length; start++) {
    if (!gap[start] || label[start]) continue;
    count++;
    let top = 0;
    stack[top++] = start;
    label[start] = 1;
    let size = 0;
    let sumCol = 0;
    let sumRow = 0;
    while (top > 0) {
      const i = stack[--top];
      const row = (i / width) | 0;
      const col = i - row * width;
      size++;
      sumCol += col;
      sumRow += row;
      for (let dr = -1; dr <= 1; dr++) {
        const r = row + dr;
        if (r < 0 || r >= height) continue;
        for (let dc = -1; dc <= 1; dc++) {
          const c = col + dc;
          if (c < 0 || c >= width || (dr === 0 && dc === 0)) continue;
          const j = r * width + c;
          if (gap[j] && !label[j]) {
            label[j] = 1;
            stack[top++] = j;
          }
        }
      }
    }
    totalCells += size;
    if (size > largestCells) {
      largestCells = size;
      largestMeanCol = sumCol / size;
      largestMeanRow = sumRow / size;
    }
  }
  return { count, totalCells, largestCells, largestMeanCol, largestMeanRow };
}

/** All figures of one target height (see the module note for what counts where). */
export function heightMetrics(input: MetricsInput): HeightMetrics {
  const { fused, pdPerRadar, radarIds, requiredPd, cellState, regions, width, height, cellSizeM } = input;
  const { originX, originY } = input;
  const cellAreaM2 = cellSizeM * cellSizeM;
  const comps = gapComponents(fused.gap, width, height);
  const radarCount = pdPerRadar.length;
  const overlapHistogram = new Array<number>(radarCount + 1).fill(0);
  const coveredCells = new Array<number>(radarCount).fill(0);
  const onlyCells = new Array<number>(radarCount).fill(0);
  const extents = input.extents;
  const overlap = fused.overlapCount;
  const combinedPd = fused.combinedPd;
  const pa = regions.protectedArea;
  const ring = regions.approachRing;
  const paCounts: RegionCounts = { cells: 0, validCells: 0, coveredCells: 0, inside: 0, nodata: 0 };
  const ringCounts: RegionCounts = { cells: 0, validCells: 0, coveredCells: 0, inside: 0, nodata: 0 };
  const valid = CellState.valid;
  // Per row, the radars whose square reaches it and their column spans (as in fuseHeight).
  const active = new Int32Array(radarCount);
  const colLo = new Int32Array(radarCount);
  const colHi = new Int32Array(radarCount);
  // One pass over the grid, row by row: region figures, overlap histogram and per-radar areas.
  for (let row = 0; row < height; row++) {
    const start = row * width;
    let na = 0;
    for (let r = 0; r < radarCount; r++) {
      const e = extents?.[r];
      if (e !== undefined && (row < e.rowMin || row > e.rowMax)) continue;
      active[na] = r;
      colLo[na] = e === undefined ? 0 : e.colMin;
      colHi[na] = e === undefined ? width - 1 : e.colMax;
      na++;
    }
    for (let col = 0; col < width; col++) {
      const i = start + col;
      const inPa = pa[i];
      const inRing = ring[i];
      if ((inPa | inRing) === 0) continue;
      const state = cellState[i];
      const covered = combinedPd[i] >= requiredPd;
      if (inPa) countRegionCell(paCounts, state, covered);
      if (inRing) countRegionCell(ringCounts, state, covered);
      if (state !== valid) continue;
      const k = overlap[i];
      overlapHistogram[k]++;
      if (k === 0) continue;
      for (let a = 0; a < na; a++) {
        if (col < colLo[a] || col > colHi[a]) continue;
        const r = active[a];
        if (pdPerRadar[r][i] >= requiredPd) {
          coveredCells[r]++;
          if (k === 1) onlyCells[r]++;
        }
      }
    }
  }
  const protectedArea = regionFigures(paCounts, cellAreaM2);
  const approachRing = regionFigures(ringCounts, cellAreaM2);
  return {
    heightAglM: input.heightAglM,
    protectedArea,
    approachRing,
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
    overlapHistogram,
    perRadar: radarIds.map((radarId, r) => ({
      radarId,
      coveredAreaM2: coveredCells[r] * cellAreaM2,
      onlyThisRadarAreaM2: onlyCells[r] * cellAreaM2,
    })),
  };
}
