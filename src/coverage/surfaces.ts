/**
 * The obstruction surface: ground plus buildings and tree stands burned on top (a 2.5-D DSM).
 *
 * Footprints arrive in the grid's projected frame (x, y in metres, the same frame as the ground
 * Grid), each ring a flat Float64Array [x0, y0, x1, y1, …]; the first and last vertex may repeat.
 * All rings of one footprint are filled with the even-odd rule, so holes (courtyards, clearings)
 * and the parts of a multipolygon need no special order or winding.
 *
 * A cell belongs to a footprint when its centre lies inside (cell-centre rule, as gdal_rasterize
 * does by default). On the boundary: a centre exactly on a left/bottom edge is inside, on a
 * right/top edge outside (half-open rule), so two footprints sharing an edge never both claim a cell.
 *
 * Overhangs and bridges (`minHeightM` > 0): a 2.5-D surface holds one height per cell, so the
 * surface takes the top of the obstruction and treats it as solid down to the ground. Sight lines
 * that would pass under a bridge are therefore masked (conservative: never reports coverage that
 * is not there), and a target below the underside counts as inside the obstruction.
 */
import { createGrid, frameOf, type Grid, type GridFrame } from "./grid.ts";

/** A building as the surface needs it: rings in grid x/y metres and heights above ground. */
export interface BuildingShape {
  /** Outer rings and holes, each flat [x0, y0, x1, y1, …] in the grid's projected frame, m. */
  rings: readonly Float64Array[];
  /** Top of the building above ground, m (roof top). NaN or ≤ 0 burns nothing. */
  heightM: number;
  /** Underside above ground, m (0 for a solid building; > 0 for a bridge or overhang). */
  minHeightM: number;
}

/** A tree stand as the surface needs it. */
export interface TreeStandShape {
  /** Outer rings and holes, each flat [x0, y0, x1, y1, …] in the grid's projected frame, m. */
  rings: readonly Float64Array[];
  /** Canopy top above ground, m. NaN or ≤ 0 burns nothing. */
  canopyHeightM: number;
}

/** The obstruction surface and, per cell, the obstruction top above ground. */
export interface ObstructionSurface {
  /** Ground + obstruction top, m (same frame and vertical datum as the ground); NaN where ground is NaN. */
  surface: Grid;
  /**
   * Top of the tallest building or canopy above ground per cell, m; 0 where open ground.
   * A target whose height above ground is below this value at a cell is inside an obstruction.
   */
  obstructionTopAglM: Float32Array;
}

/** Flat ground at one elevation over the whole frame (used when no DEM is given; say so in results). */
export function flatGround(frame: GridFrame, elevationM: number): Grid {
  return createGrid(frame, elevationM);
}

/**
 * Raise `topAglM[cell]` to `valueM` for every cell whose centre lies inside the footprint (even-odd
 * over all rings, half-open edges). Scanline fill: per grid row, the x of every edge crossing at the
 * row's centre y, sorted, filled pair by pair. Values that are NaN or not above the current top
 * change nothing, so the kernel is total.
 */
export function rasteriseMax(
  frame: GridFrame,
  rings: readonly Float64Array[],
  valueM: number,
  topAglM: Float32Array,
): void {
  if (!(valueM > 0)) return;
  let minY = Number.POSITIVE_INFINITY;
  let maxY = Number.NEGATIVE_INFINITY;
  let edgeCount = 0;
  for (const ring of rings) {
    const n = ring.length >> 1;
    if (n < 3) continue;
    edgeCount += n;
    for (let i = 1; i < ring.length; i += 2) {
      const y = ring[i];
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
  }
  if (edgeCount === 0 || !(maxY >= minY)) return;
  const { width, height, originX, originY, cellSizeM } = frame;
  // Rows whose centre y lies in [minY, maxY]: centre y = originY − (row + 0.5)·cell.
  const rowFirst = Math.max(0, Math.ceil((originY - maxY) / cellSizeM - 0.5));
  const rowLast = Math.min(height - 1, Math.floor((originY - minY) / cellSizeM - 0.5));
  if (rowLast < rowFirst) return;
  const xs = new Float64Array(edgeCount);
  for (let row = rowFirst; row <= rowLast; row++) {
    const yc = originY - (row + 0.5) * cellSizeM;
    let k = 0;
    for (const ring of rings) {
      const n = ring.length >> 1;
      if (n < 3) continue;
      let xPrev = ring[2 * (n - 1)];
      let yPrev = ring[2 * (n - 1) + 1];
      for (let i = 0; i < n; i++) {
        const x = ring[2 * i];
        const y = ring[2 * i + 1];
        // Half-open crossing test: the edge counts when yc lies in [min(y), max(y)).
        if (y > yc !== yPrev > yc) {
          xs[k++] = xPrev + ((yc - yPrev) * (x - xPrev)) / (y - yPrev);
        }
        xPrev = x;
        yPrev = y;
      }
    }
    if (k < 2) continue;
    const crossings = xs.subarray(0, k).sort();
    const rowOffset = row * width;
    for (let p = 0; p + 1 < k; p += 2) {
      const xa = crossings[p];
      const xb = crossings[p + 1];
      // Columns whose centre x lies in [xa, xb): centre x = originX + (col + 0.5)·cell.
      const colFirst = Math.max(0, Math.ceil((xa - originX) / cellSizeM - 0.5));
      const colEnd = Math.min(width, Math.ceil((xb - originX) / cellSizeM - 0.5));
      for (let col = colFirst; col < colEnd; col++) {
        const i = rowOffset + col;
        if (valueM > topAglM[i]) topAglM[i] = valueM;
      }
    }
  }
}

/**
 * Burn buildings and tree stands onto the ground: surface = ground + max(building height, canopy
 * height) inside any footprint, ground elsewhere (a 2.5-D DSM; see the file comment for overhangs).
 * Inputs: ground Grid in m (NaN = nodata stays NaN); footprints in the ground's projected frame, m.
 * Output: a new surface Grid (the ground is not modified) and the obstruction top above ground per
 * cell, m (0 outside every footprint). Footprints outside the grid burn nothing.
 */
export function burnObstructions(
  ground: Grid,
  buildings: readonly BuildingShape[],
  trees: readonly TreeStandShape[],
): ObstructionSurface {
  const frame = frameOf(ground);
  const obstructionTopAglM = new Float32Array(ground.width * ground.height);
  for (const b of buildings) rasteriseMax(frame, b.rings, b.heightM, obstructionTopAglM);
  for (const t of trees) rasteriseMax(frame, t.rings, t.canopyHeightM, obstructionTopAglM);
  const surface = createGrid(frame, 0);
  const g = ground.data;
  const s = surface.data;
  for (let i = 0; i < s.length; i++) s[i] = g[i] + obstructionTopAglM[i];
  return { surface, obstructionTopAglM };
}
