/**
 * Outlines of the gaps of one slice (d3-contour on the 0/1 gap raster, threshold ½), in grid metres,
 * with each polygon's area (shoelace on the outline, holes subtracted). Contours follow cell edges, so
 * the area equals the gap's cell count × cell area. Runs in the worker so the map thread stays free.
 */
import { contours } from "d3-contour";
import type { GridFrame } from "../coverage/grid";

export interface GapPolygonXY {
  /** Outer ring first, then holes; each ring flat [x0, y0, x1, y1, …] in grid metres. */
  rings: Float64Array[];
  areaM2: number;
}

function ringAreaCells(ring: number[][]): number {
  let s = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    s += (ring[j][0] + ring[i][0]) * (ring[j][1] - ring[i][1]);
  }
  return Math.abs(s / 2);
}

/** Gap polygons, largest first, at most `limit`. */
export function gapPolygonsXY(gap: Uint8Array, frame: GridFrame, limit = 200): GapPolygonXY[] {
  const values = new Float64Array(gap.length);
  for (let i = 0; i < gap.length; i++) values[i] = gap[i];
  const [multi] = contours().size([frame.width, frame.height]).thresholds([0.5]).smooth(false)(
    values as unknown as number[],
  );
  const cellArea = frame.cellSizeM * frame.cellSizeM;
  const out: GapPolygonXY[] = [];
  for (const polygon of multi.coordinates) {
    const areaCells = polygon.reduce((acc, ring, k) => acc + (k === 0 ? 1 : -1) * ringAreaCells(ring), 0);
    const rings = polygon.map((ring) => {
      const flat = new Float64Array(ring.length * 2);
      ring.forEach(([c, r], k) => {
        flat[2 * k] = frame.originX + c * frame.cellSizeM;
        flat[2 * k + 1] = frame.originY - r * frame.cellSizeM;
      });
      return flat;
    });
    out.push({ rings, areaM2: areaCells * cellArea });
  }
  out.sort((a, b) => b.areaM2 - a.areaM2);
  return out.slice(0, limit);
}
