/**
 * A new plan around a point: a 400 m square protected area, a 500 m approach ring, no posts, one target
 * class, the usual requirement and flat ground. The radar library of the previous plan is kept.
 */

import { EARTH_RADIUS_M } from "../coverage/constants";
import type { RadarModel } from "../coverage/radarModel";
import { degToRad, radToDeg } from "../coverage/units";
import { PLAN_VERSION, type Plan } from "../io/planSchema";
import { formatLocalMinute } from "./numberText";

/** Half side of the starting protected area, m. */
const START_HALF_SIDE_M = 200;

/** "New site 2026-12-03 07:45": a name of its own, so that new plans do not replace each other in the recent list. */
export function newSiteName(at: Date = new Date()): string {
  return `New site ${formatLocalMinute(at)}`;
}

export function newPlanAround(
  lonDeg: number,
  latDeg: number,
  radarModels: RadarModel[],
  name = newSiteName(),
): Plan {
  const dLat = radToDeg(START_HALF_SIDE_M / EARTH_RADIUS_M);
  const dLon = dLat / Math.cos(degToRad(latDeg));
  const ring = [
    [lonDeg - dLon, latDeg - dLat],
    [lonDeg + dLon, latDeg - dLat],
    [lonDeg + dLon, latDeg + dLat],
    [lonDeg - dLon, latDeg + dLat],
    [lonDeg - dLon, latDeg - dLat],
  ];
  return {
    version: PLAN_VERSION,
    site: { name },
    protectedAreas: [
      { id: "area-1", name: "Protected area", geometry: { type: "Polygon", coordinates: [ring] } },
    ],
    approachRingDepthM: 500,
    posts: [],
    radarModels,
    targetClasses: [
      {
        id: "small-drone",
        name: "Small drone",
        rcsDbsm: -20,
        swerling: 1,
        speedMPerS: 15,
        heightsAglM: [10, 30, 60],
      },
    ],
    requirement: { requiredPd: 0.9, pfa: 1e-6, looks: 1 },
    terrain: {
      ground: { type: "flat", elevationAmslM: 0 },
      buildings: { type: "FeatureCollection", features: [] },
      treeStands: [],
    },
    analysis: {
      cellSizeM: "auto",
      effectiveEarthFactor: 4 / 3,
      targetHeightsM: [10, 30, 60],
      maskMode: "accurate",
    },
  };
}
