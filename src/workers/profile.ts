/**
 * The terrain profile from a radar to a point for the inspect chart: ground and obstruction surface
 * sampled bilinearly along the path, the Earth-curvature drop and the first Fresnel zone radius
 * (propagation.ts), on PROFILE_SAMPLES points.
 */
import type { PlacedRadar } from "../coverage/coverage";
import type { PreparedSite } from "../coverage/evaluate";
import { sampleBilinear, xToCol, yToRow } from "../coverage/grid";
import { curvatureDropM, fresnelZoneRadiusM } from "../coverage/propagation";
import type { ProfileData } from "./protocol";

/** Points along a profile (enough for a chart a few hundred pixels wide). */
export const PROFILE_SAMPLES = 200;

export function terrainProfile(
  site: PreparedSite,
  radar: PlacedRadar,
  at: { x: number; y: number },
  targetAglM: number,
): ProfileData {
  const ground = { ...site.frame, data: site.ground };
  const surface = { ...site.frame, data: site.surface };
  const total = Math.hypot(at.x - radar.x, at.y - radar.y);
  const distanceM: number[] = [];
  const groundAmslM: number[] = [];
  const surfaceAmslM: number[] = [];
  const drop: number[] = [];
  const fresnel: number[] = [];
  for (let i = 0; i <= PROFILE_SAMPLES; i++) {
    const t = i / PROFILE_SAMPLES;
    const x = radar.x + (at.x - radar.x) * t;
    const y = radar.y + (at.y - radar.y) * t;
    const c = xToCol(site.frame, x);
    const r = yToRow(site.frame, y);
    const d = total * t;
    distanceM.push(d);
    groundAmslM.push(sampleBilinear(ground, c, r));
    surfaceAmslM.push(sampleBilinear(surface, c, r));
    // Drop of the Earth's surface below the radar's horizontal plane at distance d (for the chart).
    drop.push(curvatureDropM(d, site.effectiveEarthFactor));
    fresnel.push(
      d > 0 && d < total
        ? fresnelZoneRadiusM({ frequencyHz: radar.model.frequencyHz, d1M: d, d2M: total - d })
        : 0,
    );
  }
  const endIdx = PROFILE_SAMPLES;
  const targetGround = groundAmslM[endIdx];
  return {
    distanceM,
    groundAmslM,
    surfaceAmslM,
    antennaAmslM: radar.antennaHeightAslM,
    targetAmslM: targetGround + targetAglM,
    curvatureDropM: drop,
    fresnelRadiusM: fresnel,
    frequencyHz: radar.model.frequencyHz,
  };
}
