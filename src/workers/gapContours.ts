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

/** Gap outlines in grid metres (at most `limit` polygons, the ones with the most vertices first). */
export function gapOutlinesXY(gap: Uint8Array, frame: GridFrame, limit = 400): GapPolygonXY[] {
  const values = new Float64Array(gap.length);
  for (let i = 0; i < gap.length; i++) values[i] = gap[i];
  const [multi] = contours().size([frame.width, frame.height]).thresholds([0.5]).smooth(false)(
    values as unknown as number[],
  );
  const polys = multi.coordinates.map((polygon) => ({
    rings: polygon.map((ring) => {
      const flat = new Float64Array(ring.length * 2);
      ring.forEach(([c, r], k) => {
        flat[2 * k] = frame.originX + c * frame.cellSizeM;
        flat[2 * k + 1] = frame.originY - r * frame.cellSizeM;
      });
      return flat;
    }),
  }));
  polys.sort((a, b) => b.rings[0].length - a.rings[0].length);
  return polys.slice(0, limit);
}

/** One label per 8-connected gap component, largest first, at most `limit`. */
export function gapLabelsXY(gap: Uint8Array, frame: GridFrame, limit = 50): GapLabelXY[] {
  const { width: w, height: h, cellSizeM } = frame;
  const seen = new Uint8Array(gap.length);
  const stack: number[] = [];
  const labels: (GapLabelXY & { cells: number })[] = [];
  const members: number[] = [];
  for (let start = 0; start < gap.length; start++) {
    if (!gap[start] || seen[start]) continue;
    members.length = 0;
    stack.push(start);
    seen[start] = 1;
    let sumC = 0;
    let sumR = 0;
    while (stack.length > 0) {
      const i = stack.pop() as number;
      members.push(i);
      const r = Math.floor(i / w);
      const c = i - r * w;
      sumC += c;
      sumR += r;
      for (let dr = -1; dr <= 1; dr++) {
        const rr = r + dr;
        if (rr < 0 || rr >= h) continue;
        for (let dc = -1; dc <= 1; dc++) {
          const cc = c + dc;
          if (cc < 0 || cc >= w || (dr === 0 && dc === 0)) continue;
          const j = rr * w + cc;
          if (gap[j] && !seen[j]) {
            seen[j] = 1;
            stack.push(j);
          }
        }
      }
    }
    const n = members.length;
    const mc = sumC / n;
    const mr = sumR / n;
    let best = members[0];
    let bestD = Number.POSITIVE_INFINITY;
    for (const i of members) {
      const r = Math.floor(i / w);
      const d = (i - r * w - mc) ** 2 + (r - mr) ** 2;
      if (d < bestD) {
        bestD = d;
        best = i;
      }
    }
    const br = Math.floor(best / w);
    const bc = best - br * w;
    labels.push({
      x: frame.originX + (bc + 0.5) * cellSizeM,
      y: frame.originY - (br + 0.5) * cellSizeM,
      areaM2: n * cellSizeM * cellSizeM,
      cells: n,
    });
  }
  labels.sort((a, b) => b.cells - a.cells);
  return labels.slice(0, limit).map(({ x, y, areaM2 }) => ({ x, y, areaM2 }));
}

export function gapShapesXY(gap: Uint8Array, frame: GridFrame): GapShapesXY {
  return { outlines: gapOutlinesXY(gap, frame), labels: gapLabelsXY(gap, frame) };
}
