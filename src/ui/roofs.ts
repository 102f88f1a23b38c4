/**
 * Buildings and tree stands under a point: the roof to snap a post to, and the obstruction a click on
 * the map selects for editing. Heights follow the rule of the import (buildings.ts): `height`, else
 * `building:levels` × metres per level, else the default.
 */
import booleanPointInPolygon from "@turf/boolean-point-in-polygon";
import { DEFAULT_BUILDING_HEIGHT_M, DEFAULT_METRES_PER_LEVEL } from "../coverage/constants";
import type { AreaGeometry, BuildingProperties, Plan } from "../io/planSchema";

/** Where a building's roof height comes from, as the editor says it. */
export type RoofHeightSource = "height" | "levels" | "default";

export function roofHeightOf(p: BuildingProperties): { heightM: number; source: RoofHeightSource } {
  if (p.height !== undefined) return { heightM: p.height, source: "height" };
  if (p["building:levels"] !== undefined)
    return { heightM: p["building:levels"] * DEFAULT_METRES_PER_LEVEL, source: "levels" };
  return { heightM: DEFAULT_BUILDING_HEIGHT_M, source: "default" };
}

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

/** The obstruction a click selects: a building (by index, as features may carry no id) or a tree stand. */
export type ObstructionRef = { kind: "building"; index: number } | { kind: "tree"; id: string };

/** The building under the point, else the tree stand, else null. */
export function obstructionUnder(plan: Plan, lonDeg: number, latDeg: number): ObstructionRef | null {
  const roof = roofUnder(plan, lonDeg, latDeg);
  if (roof) return { kind: "building", index: roof.index };
  const t = plan.terrain.treeStands.find((s) => inside(lonDeg, latDeg, s.geometry));
  return t ? { kind: "tree", id: t.id } : null;
}
