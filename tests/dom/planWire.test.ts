/** The plan as the page posts it to the workers: footprints as text for large imports, the same run. */
import { describe, expect, it } from "vitest";
import type { BuildingFeature, Plan } from "../../src/io/planSchema";
import { createCoverageApi } from "../../src/workers/coverageApi";
import { BUILDINGS_AS_TEXT_ABOVE, planFromWire, planToWire } from "../../src/workers/planWire";
import { ridgeDemoDem as dem, ridgeDemoPlan as demoPlan } from "./ridgeDemo";
import { squareGeometry } from "./squareGeometry";

/** The demo plan with a block of `n` small footprints added south of the site (a town's import). */
function withTown(plan: Plan, n: number): Plan {
  const [lon, lat] = (plan.protectedAreas[0].geometry.coordinates[0] as number[][])[0];
  const town: BuildingFeature[] = Array.from({ length: n }, (_, k) => ({
    type: "Feature",
    id: `town-${k}`,
    geometry: squareGeometry(lon + 0.0003 * (k % 40), lat - 0.002 - 0.0003 * Math.floor(k / 40), 0.00012),
    properties: { height: 6 + (k % 7), name: `Shed "${k}" <b>` },
  }));
  const buildings = plan.terrain.buildings;
  return {
    ...plan,
    terrain: { ...plan.terrain, buildings: { ...buildings, features: [...buildings.features, ...town] } },
  };
}

describe("plan on the wire to the workers", () => {
  it("sends a small plan as it is, and a large import's footprints as text that reads back to the same plan", () => {
    const small = demoPlan();
    expect(small.terrain.buildings.features.length).toBeLessThanOrEqual(BUILDINGS_AS_TEXT_ABOVE);
    expect(planToWire(small)).toEqual({ plan: small });
    const large = withTown(small, BUILDINGS_AS_TEXT_ABOVE + 100);
    const w = planToWire(large);
    expect(w.plan.terrain.buildings.features).toEqual([]);
    expect(typeof w.buildingsJson).toBe("string");
    expect(planFromWire(structuredClone(w))).toEqual(large);
    // The rest of the plan is untouched, and the page's plan was not changed.
    expect({ ...w.plan, terrain: { ...w.plan.terrain, buildings: large.terrain.buildings } }).toEqual(large);
    expect(large.terrain.buildings.features).toHaveLength(small.terrain.buildings.features.length + 600);
  });

  it("evaluates the same coverage from the wire form as from the whole plan", async () => {
    const plan = withTown(demoPlan(), BUILDINGS_AS_TEXT_ABOVE + 100);
    const whole = await createCoverageApi().evaluate({
      generation: 1,
      plan,
      dem: dem(),
      perRadarPostId: null,
    });
    const wired = await createCoverageApi().evaluate({
      generation: 1,
      ...structuredClone(planToWire(plan)),
      dem: dem(),
      perRadarPostId: null,
    });
    expect(wired.slices.map((s) => s.metrics)).toEqual(whole.slices.map((s) => s.metrics));
    expect(Array.from(wired.obstructionTopAglM)).toEqual(Array.from(whole.obstructionTopAglM));
    // The town is in the obstruction surface: more cells inside a building than the demo alone has.
    const bare = await createCoverageApi().evaluate({
      generation: 1,
      plan: demoPlan(),
      dem: dem(),
      perRadarPostId: null,
    });
    const roofed = (v: { obstructionTopAglM: Float32Array }) =>
      v.obstructionTopAglM.filter((x) => x > 0).length;
    expect(roofed(wired)).toBeGreaterThan(roofed(bare));
  });
});
