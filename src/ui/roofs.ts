/**
 * Buildings and tree stands under a point: the roof to snap a post to, and the obstruction a click on
 * the map selects for editing. Roof heights as the obstruction surface reads them (io/buildingHeight.ts).
 */
import booleanPointInPolygon from "@turf/boolean-point-in-polygon";
import { roofHeightOf } from "../io/buildingHeight";
import type { AreaGeometry, Plan } from "../io/planSchema";
import type { ObstructionChoice } from "../map/siteLayer";

function inside(lonDeg: number, latDeg: number, g: AreaGeometry): boolean {
  const pt = { type: "Point" as const, coordinates: [lonDeg, latDeg] };
  return booleanPointInPolygon(pt, g as Parameters<typeof booleanPointInPolygon>[1]);
}

export function roofUnder(
  plan: Plan,
  lonDeg: number,
  latDeg: number,
): { index: number; heightM: number } | null {
  const fs = plan.terrain.buildings.features;
  for (let i = 0; i < fs.length; i++) {
    if (inside(lonDeg, latDeg, fs[i].geometry))
      return { index: i, heightM: roofHeightOf(fs[i].properties).heightM };
  }
  return null;
}

/** The building under the point, else the tree stand, else null. */
export function obstructionUnder(plan: Plan, lonDeg: number, latDeg: number): ObstructionChoice | null {
  const roof = roofUnder(plan, lonDeg, latDeg);
  if (roof) return { kind: "building", index: roof.index };
  const t = plan.terrain.treeStands.find((s) => inside(lonDeg, latDeg, s.geometry));
  return t ? { kind: "tree", id: t.id } : null;
}
