/** The building footprint under a point, with its roof height (for snapping posts to roofs). */
import booleanPointInPolygon from "@turf/boolean-point-in-polygon";
import { DEFAULT_BUILDING_HEIGHT_M, DEFAULT_METRES_PER_LEVEL } from "../coverage/constants";
import type { Plan } from "../io/planSchema";

export function roofUnder(
  plan: Plan,
  lonDeg: number,
  latDeg: number,
): { index: number; heightM: number } | null {
  const pt = { type: "Point" as const, coordinates: [lonDeg, latDeg] };
  const fs = plan.terrain.buildings.features;
  for (let i = 0; i < fs.length; i++) {
    const f = fs[i];
    if (!booleanPointInPolygon(pt, f.geometry as Parameters<typeof booleanPointInPolygon>[1])) continue;
    const p = f.properties;
    const h =
      p.height ??
      (p["building:levels"] !== undefined
        ? p["building:levels"] * DEFAULT_METRES_PER_LEVEL
        : DEFAULT_BUILDING_HEIGHT_M);
    return { index: i, heightM: h };
  }
  return null;
}
