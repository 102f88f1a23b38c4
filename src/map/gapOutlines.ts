/**
 * Gap shapes for the map: outlines and labels in grid metres (src/workers/gapContours.ts) turned into
 * Leaflet [lat, lon] coordinates.
 */
import type { GridFrame } from "../coverage/grid";
import { type GapShapesXY, gapShapesXY } from "../workers/gapContours";

export interface GapShapes {
  /** Polygons, each as rings of [lat, lon] (outer first, then holes). */
  outlines: [number, number][][][];
  /** Largest first: where to write each gap's area, and the area, m². */
  labels: { at: [number, number]; areaM2: number }[];
}

export function shapesToLatLng(
  s: GapShapesXY,
  toLonLat: (x: number, y: number) => [number, number],
): GapShapes {
  const ll = (x: number, y: number): [number, number] => {
    const [lon, lat] = toLonLat(x, y);
    return [lat, lon];
  };
  return {
    outlines: s.outlines.map((p) =>
      p.rings.map((flat) => {
        const ring: [number, number][] = [];
        for (let i = 0; i + 1 < flat.length; i += 2) ring.push(ll(flat[i], flat[i + 1]));
        return ring;
      }),
    ),
    labels: s.labels.map((l) => ({ at: ll(l.x, l.y), areaM2: l.areaM2 })),
  };
}

/** Gap shapes computed here (used when the worker did not send them for the shown slice). */
export function gapShapes(
  gap: Uint8Array,
  frame: GridFrame,
  toLonLat: (x: number, y: number) => [number, number],
): GapShapes {
  return shapesToLatLng(gapShapesXY(gap, frame), toLonLat);
}

/** An area for a label: m² below 1 ha, else hectares. */
export function formatAreaM2(areaM2: number): string {
  const M2_PER_HA = 10_000;
  return areaM2 < M2_PER_HA ? `${Math.round(areaM2)} m²` : `${(areaM2 / M2_PER_HA).toFixed(2)} ha`;
}
