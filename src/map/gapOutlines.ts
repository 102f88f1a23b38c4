/**
 * Outlines of the gaps (d3-contour on the 0/1 gap raster, threshold ½), as lon/lat polygons with their
 * areas in m² on the metric grid (shoelace on the outline in grid metres, holes subtracted). Contours
 * follow cell edges, so the area equals the gap's cell count × cell area.
 */
import { contours } from "d3-contour";
import type { GridFrame } from "../coverage/grid";

export interface GapOutline {
  /** Rings as [lat, lon] (Leaflet order): outer first, then holes. */
  rings: [number, number][][];
  areaM2: number;
  /** A point inside for the label, [lat, lon]. */
  labelAt: [number, number];
}

function ringAreaM2(ring: number[][], cellSizeM: number): number {
  let s = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    s += (ring[j][0] + ring[i][0]) * (ring[j][1] - ring[i][1]);
  }
  return Math.abs(s / 2) * cellSizeM * cellSizeM;
}

/** Gap outlines, largest first, at most `limit` of them. */
export function gapOutlines(
  gap: Uint8Array,
  frame: GridFrame,
  toLonLat: (x: number, y: number) => [number, number],
  limit = 200,
): GapOutline[] {
  const values = new Float64Array(gap.length);
  for (let i = 0; i < gap.length; i++) values[i] = gap[i];
  const [multi] = contours().size([frame.width, frame.height]).thresholds([0.5]).smooth(false)(
    values as unknown as number[],
  );
  const out: GapOutline[] = [];
  for (const polygon of multi.coordinates) {
    const areaM2 = polygon.reduce(
      (acc, ring, k) => acc + (k === 0 ? 1 : -1) * ringAreaM2(ring, frame.cellSizeM),
      0,
    );
    const rings = polygon.map((ring) =>
      ring.map(([c, r]) => {
        const [lon, lat] = toLonLat(frame.originX + c * frame.cellSizeM, frame.originY - r * frame.cellSizeM);
        return [lat, lon] as [number, number];
      }),
    );
    // Label at the outer ring's vertex mean (inside for the compact shapes gaps mostly have).
    const outer = rings[0];
    const lat = outer.reduce((a, p) => a + p[0], 0) / outer.length;
    const lon = outer.reduce((a, p) => a + p[1], 0) / outer.length;
    out.push({ rings, areaM2, labelAt: [lat, lon] });
  }
  out.sort((a, b) => b.areaM2 - a.areaM2);
  return out.slice(0, limit);
}

/** An area for a label: m² below 1 ha, else hectares. */
export function formatAreaM2(areaM2: number): string {
  const M2_PER_HA = 10_000;
  return areaM2 < M2_PER_HA ? `${Math.round(areaM2)} m²` : `${(areaM2 / M2_PER_HA).toFixed(2)} ha`;
}
