/** A small valid plan (invented site in open country) for DOM tests. */
import radar from "../../demo-sites/radars/kalvori-x9-rotating-pulsed.json";
import type { RadarModel } from "../../src/coverage/radarModel";
import type { Plan } from "../../src/io/planSchema";

export function samplePlan(): Plan {
  const lon = 15.3;
  const lat = 47.1;
  const d = 0.002;
  return {
    version: 1,
    site: { name: "Test meadow (invented)" },
    protectedAreas: [
      {
        id: "area-1",
        name: "Yard",
        geometry: {
          type: "Polygon",
          coordinates: [
            [
              [lon - d, lat - d],
              [lon + d, lat - d],
              [lon + d, lat + d],
              [lon - d, lat + d],
              [lon - d, lat - d],
            ],
          ],
        },
      },
    ],
    approachRingDepthM: 300,
    posts: [
      {
        id: "post-1",
        name: "Gate mast",
        position: { lonDeg: lon, latDeg: lat },
        mounting: "ground",
        mastHeightM: 12,
        radarModelId: "kalvori-x9",
        boresightAzDeg: 0,
        tiltDeg: 0,
        enabled: true,
      },
    ],
    radarModels: [radar as RadarModel],
    targetClasses: [
      { id: "small", name: "Small drone", rcsDbsm: -20, swerling: 1, speedMPerS: 15, heightsAglM: [10, 50] },
    ],
    requirement: { requiredPd: 0.9, pfa: 1e-6, looks: 1 },
    terrain: {
      ground: { type: "flat", elevationAmslM: 300 },
      buildings: { type: "FeatureCollection", features: [] },
      treeStands: [],
    },
    analysis: { cellSizeM: 10, effectiveEarthFactor: 4 / 3, targetHeightsM: [10, 50], maskMode: "accurate" },
  };
}
