/**
 * A plan building's roof height and display name, the way the obstruction surface reads them (as the
 * import does, buildings.ts): `height`, else `building:levels` × metres per level, else the default.
 */
import { DEFAULT_BUILDING_HEIGHT_M, DEFAULT_METRES_PER_LEVEL } from "../coverage/constants.ts";
import type { BuildingFeature, BuildingProperties } from "./planSchema.ts";

/** Where a building's roof height comes from. */
export type RoofHeightSource = "height" | "levels" | "default";

/**
 * The roof height and where it came from. An imported footprint stores its height as found
 * (`height`) with `heightSource` when the file gave levels or nothing, so that the source survives.
 */
export function roofHeightOf(p: BuildingProperties): { heightM: number; source: RoofHeightSource } {
  if (p.height !== undefined) {
    const made = p.heightSource;
    return { heightM: p.height, source: made === "levels" || made === "default" ? made : "height" };
  }
  if (p["building:levels"] !== undefined)
    return { heightM: p["building:levels"] * DEFAULT_METRES_PER_LEVEL, source: "levels" };
  return { heightM: DEFAULT_BUILDING_HEIGHT_M, source: "default" };
}

/** Its `name`, else "Building n" by its place in the plan (index + 1). */
export function buildingName(f: BuildingFeature, index: number): string {
  return typeof f.properties.name === "string" ? f.properties.name : `Building ${index + 1}`;
}
