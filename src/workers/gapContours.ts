/**
 * The shapes of the gaps of one slice, for the map: outlines (d3-contour on the 0/1 gap raster,
 * threshold ½, in grid metres; marching squares cut each convex corner by an eighth of a cell, so the
 * outlines are for the eye) and one label per gap (8-connected component, as the metrics count them)
 * with its exact area, cell count × cell area, placed on the component's cell nearest its mean.
 * Runs in the worker so the map thread stays free.
 */
import { contours } from "d3-contour";
import type { GridFrame } from "../coverage/grid";

/** One outline polygon: outer ring first, then holes; each ring flat [x0, y0, x1, y1, …] in grid metres. */
export interface GapPolygonXY {
  rings: Float64Array[];
}

/** One gap: its label position (grid metres, a cell centre of the gap) and area, m². */
export interface GapLabelXY {
  x: number;
  y: number;
  areaM2: number;
}

export interface GapShapesXY {
  outlines: GapPolygonXY[];
  /** Largest first. */
  labels: GapLabelXY[];
}

/**
 * Work arrays kept from call to call in this thread: a release outlines the shown slice's gaps again,
 * and 13 bytes per cell of new memory (the contour raster, the flood fill's marks and cells) cost
 * their first write each time, about 1 ms per MB.
 */
const scratch = { values: new Float64Array(0), seen: new Uint8Array(0), cells: new Int32Array(0) };

/** Columns c0…c1−1 and rows r0…r1−1 that hold every gap cell, or null when there is none. */
function gapBounds(
  gap: Uint8Array,
  width: number,
): { c0: number; c1: number; r0: number; r1: number } | null {
  let c0 = width;
  let c1 = -1;
  let r0 = -1;
  let r1 = -1;
  const height = gap.length / width;
  for (let r = 0; r < height; r++) {
    const row = r * width;
    let first = -1;
    let last = -1;
    for (let c = 0; c < width; c++) {
      if (gap[row + c] !== 0) {
        if (first < 0) first = c;
        last = c;
      }
    }
    if (first < 0) continue;
    if (r0 < 0) r0 = r;
    r1 = r;
    if (first < c0) c0 = first;
    if (last > c1) c1 = last;
  }
  return r0 < 0 ? null : { c0, c1: c1 + 1, r0, r1: r1 + 1 };
}

/**
 * Gap outlines in grid metres (at most `limit` polygons, the ones with the most vertices first).
 * Contoured on the gaps' bounding box only: d3-contour treats everything beyond its raster as below
 * the threshold, so the rings are the same as on the whole grid, in less time when gaps are few.
 */
export function gapOutlinesXY(gap: Uint8Array, frame: GridFrame, limit = 400): GapPolygonXY[] {
  const box = gapBounds(gap, frame.width);
  if (box === null) return [];
  const w = box.c1 - box.c0;
  const h = box.r1 - box.r0;
  if (scratch.values.length < w * h) scratch.values = new Float64Array(w * h);
  const values = scratch.values.subarray(0, w * h);
  for (let r = 0; r < h; r++) {
    const from = (r + box.r0) * frame.width + box.c0;
    for (let c = 0; c < w; c++) values[r * w + c] = gap[from + c];
  }
  const [multi] = contours().size([w, h]).thresholds([0.5]).smooth(false)(values as unknown as number[]);
  const x0 = frame.originX + box.c0 * frame.cellSizeM;
  const y0 = frame.originY - box.r0 * frame.cellSizeM;
  const polys = multi.coordinates.map((polygon) => ({
    rings: polygon.map((ring) => {
      const flat = new Float64Array(ring.length * 2);
      for (let k = 0; k < ring.length; k++) {
        flat[2 * k] = x0 + ring[k][0] * frame.cellSizeM;
        flat[2 * k + 1] = y0 - ring[k][1] * frame.cellSizeM;
      }
      return flat;
    }),
  }));
  polys.sort((a, b) => b.rings[0].length - a.rings[0].length);
  return polys.slice(0, limit);
}

/**
 * One label per 8-connected gap component, largest first, at most `limit`. Flood fill with one
 * typed array that holds the stack and, behind it, the members found so far of the component.
 */
export function gapLabelsXY(gap: Uint8Array, frame: GridFrame, limit = 50): GapLabelXY[] {
  const { width: w, height: h, cellSizeM } = frame;
  if (scratch.seen.length < gap.length) {
    scratch.seen = new Uint8Array(gap.length);
    scratch.cells = new Int32Array(gap.length);
  }
  const seen = scratch.seen;
  seen.fill(0, 0, gap.length);
  // Members of the current component fill cells[0…count) in the order they were reached; the cells
  // still to visit are the members not yet expanded, cells[next…count).
  const cells = scratch.cells;
  const labels: (GapLabelXY & { cells: number })[] = [];
  for (let start = 0; start < gap.length; start++) {
    if (gap[start] === 0 || seen[start] !== 0) continue;
    let count = 0;
    cells[count++] = start;
    seen[start] = 1;
    let sumC = 0;
    let sumR = 0;
    for (let next = 0; next < count; next++) {
      const i = cells[next];
      const r = (i / w) | 0;
      const c = i - r * w;
      sumC += c;
      sumR += r;
      const rLo = r > 0 ? r - 1 : 0;
      const rHi = r < h - 1 ? r + 1 : h - 1;
      const cLo = c > 0 ? c - 1 : 0;
      const cHi = c < w - 1 ? c + 1 : w - 1;
      for (let rr = rLo; rr <= rHi; rr++) {
        for (let cc = cLo, j = rr * w + cLo; cc <= cHi; cc++, j++) {
          if (gap[j] !== 0 && seen[j] === 0) {
            seen[j] = 1;
            cells[count++] = j;
          }
        }
      }
    }
    const mc = sumC / count;
    const mr = sumR / count;
    let best = cells[0];
    let bestD = Number.POSITIVE_INFINITY;
    for (let k = 0; k < count; k++) {
      const i = cells[k];
      const r = (i / w) | 0;
      const d = (i - r * w - mc) ** 2 + (r - mr) ** 2;
      if (d < bestD || (d === bestD && i < best)) {
        bestD = d;
        best = i;
      }
    }
    const br = (best / w) | 0;
    const bc = best - br * w;
    labels.push({
      x: frame.originX + (bc + 0.5) * cellSizeM,
      y: frame.originY - (br + 0.5) * cellSizeM,
      areaM2: count * cellSizeM * cellSizeM,
      cells: count,
    });
  }
  labels.sort((a, b) => b.cells - a.cells);
  return labels.slice(0, limit).map(({ x, y, areaM2 }) => ({ x, y, areaM2 }));
}

export function gapShapesXY(gap: Uint8Array, frame: GridFrame): GapShapesXY {
  return { outlines: gapOutlinesXY(gap, frame), labels: gapLabelsXY(gap, frame) };
}
