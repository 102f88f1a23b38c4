/**
 * Gap shapes for the map: outlines and labels in grid metres (src/workers/gapContours.ts), turned into
 * Leaflet [lat, lon] coordinates as the gap layer draws them.
 */
import type { GridFrame } from "../coverage/grid";
import { type GapShapesXY, gapShapesXY } from "../workers/gapContours";

/** Gap shapes in grid metres with the way to geographic coordinates, for the map to draw. */
export interface GapOutlineSource {
  shapes: GapShapesXY;
  /** Grid x, y (m) to [lon, lat] in degrees. */
  toLonLat: (x: number, y: number) => [number, number];
}

/** One ring of grid x, y pairs (m) as Leaflet [lat, lon] pairs. */
export function ringToLatLng(
  flat: ArrayLike<number>,
  toLonLat: (x: number, y: number) => [number, number],
): [number, number][] {
  const ring: [number, number][] = [];
  for (let i = 0; i + 1 < flat.length; i += 2) {
    const [lon, lat] = toLonLat(flat[i], flat[i + 1]);
    ring.push([lat, lon]);
  }
  return ring;
}

/** Gap shapes found here (used when the worker did not send them for the shown slice). */
export function gapOutlineSource(
  gap: Uint8Array,
  frame: GridFrame,
  toLonLat: (x: number, y: number) => [number, number],
): GapOutlineSource {
  return { shapes: gapShapesXY(gap, frame), toLonLat };
}

/** An area for a label: m² below 1 ha, else hectares. */
export function formatAreaM2(areaM2: number): string {
  const M2_PER_HA = 10_000;
  return areaM2 < M2_PER_HA ? `${Math.round(areaM2)} m²` : `${(areaM2 / M2_PER_HA).toFixed(2)} ha`;
}
