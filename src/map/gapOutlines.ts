/**
 * Gap outlines for the map: polygons in grid metres (src/workers/gapContours.ts) turned into Leaflet
 * [lat, lon] rings with a label point and their area.
 */
import type { GridFrame } from "../coverage/grid";
import { type GapPolygonXY, gapPolygonsXY } from "../workers/gapContours";

export interface GapOutline {
  /** Rings as [lat, lon] (Leaflet order): outer first, then holes. */
  rings: [number, number][][];
  areaM2: number;
  /** A point for the label, [lat, lon]. */
  labelAt: [number, number];
}

/** Converts polygons in grid metres to map outlines. */
export function outlinesToLatLng(
  polygons: GapPolygonXY[],
  toLonLat: (x: number, y: number) => [number, number],
): GapOutline[] {
  return polygons.map((p) => {
    const rings = p.rings.map((flat) => {
      const ring: [number, number][] = [];
      for (let i = 0; i + 1 < flat.length; i += 2) {
        const [lon, lat] = toLonLat(flat[i], flat[i + 1]);
        ring.push([lat, lon]);
      }
      return ring;
    });
    // Label at the outer ring's vertex mean (inside for the compact shapes gaps mostly have).
    const outer = rings[0];
    const lat = outer.reduce((a, q) => a + q[0], 0) / outer.length;
    const lon = outer.reduce((a, q) => a + q[1], 0) / outer.length;
    return { rings, areaM2: p.areaM2, labelAt: [lat, lon] as [number, number] };
  });
}

/** Gap outlines computed here (used when the worker did not send them for the shown slice). */
export function gapOutlines(
  gap: Uint8Array,
  frame: GridFrame,
  toLonLat: (x: number, y: number) => [number, number],
  limit = 200,
): GapOutline[] {
  return outlinesToLatLng(gapPolygonsXY(gap, frame, limit), toLonLat);
}

/** An area for a label: m² below 1 ha, else hectares. */
export function formatAreaM2(areaM2: number): string {
  const M2_PER_HA = 10_000;
  return areaM2 < M2_PER_HA ? `${Math.round(areaM2)} m²` : `${(areaM2 / M2_PER_HA).toFixed(2)} ha`;
}
