import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import type { Plan } from "../../src/io/planSchema.ts";
import { parsePlan } from "../../src/io/planValidation.ts";
import { type LoadedDem, PrepareError, preparePlan } from "../../src/io/preparePlan.ts";

function load(path: string): Plan {
  const r = parsePlan(JSON.parse(readFileSync(path, "utf8")));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.plan;
}

function ridgeDem(): LoadedDem {
  const b = readFileSync("demo-sites/ridge-waterworks/terrain.tif");
  return {
    fileName: "terrain.tif",
    data: b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer,
  };
}

describe("preparePlan", () => {
  it("[PP1] the ridge site: DEM ground, buildings burned, roof posts keep their own roof, enabled radars only", async () => {
    const plan = load("demo-sites/ridge-waterworks/plan.json");
    const { site, grid } = await preparePlan(plan, ridgeDem());
    expect(site.groundSource).toBe("dem");
    expect(site.radars.map((r) => r.id)).toEqual(plan.posts.filter((p) => p.enabled).map((p) => p.id));
    const hallA = site.radars.find((r) => r.id === "hall-a-roof")!;
    // Filter hall A is 80 × 30 m: its own roof reaches at least 15 m from the post at its centre.
    expect(hallA.ownFootprintRadiusM).toBeGreaterThanOrEqual(15);
    expect(site.radars.find((r) => r.id === "south-gate")!.ownFootprintRadiusM).toBe(0);
    // Antenna = ground under the post + mast height (roof included).
    const col = Math.floor((hallA.x - grid.frame.originX) / grid.frame.cellSizeM);
    const row = Math.floor((grid.frame.originY - hallA.y) / grid.frame.cellSizeM);
    expect(hallA.antennaHeightAslM - site.ground[row * grid.frame.width + col]).toBeCloseTo(17, 0);
    let top = 0;
    for (const v of site.obstructionTopAglM) top = Math.max(top, v);
    expect(top).toBe(35);
    let inArea = 0;
    let inRing = 0;
    for (let i = 0; i < site.regions.protectedArea.length; i++) {
      inArea += site.regions.protectedArea[i];
      inRing += site.regions.approachRing[i];
      expect(site.regions.protectedArea[i] & site.regions.approachRing[i]).toBe(0);
    }
    // Fence line ≈ 480 × 320 m less a corner (≈ 0.15 km²) at 100 m² per cell; ring 400 m deep.
    expect(inArea * 100).toBeGreaterThan(140_000);
    expect(inArea * 100).toBeLessThan(160_000);
    expect(inRing).toBeGreaterThan(inArea);
  });

  it("[PP2] flat ground without buildings prepares and says the ground is flat; a missing DEM names the field", async () => {
    const plan = load("demo-sites/container-terminal/plan.json");
    const bare = {
      ...plan,
      terrain: { ...plan.terrain, buildings: { type: "FeatureCollection" as const, features: [] } },
    };
    const { site } = await preparePlan(bare);
    expect(site.groundSource).toBe("flat");
    expect(site.warnings.join(" ")).toMatch(/flat/);
    expect(Math.max(...site.obstructionTopAglM)).toBe(0);
    const ridge = load("demo-sites/ridge-waterworks/plan.json");
    await expect(preparePlan(ridge)).rejects.toThrow(/terrain\.ground\.file/);
    await expect(preparePlan(ridge)).rejects.toBeInstanceOf(PrepareError);
  });

  it("[PP3] a post beyond the DEM is refused with its path", async () => {
    const plan = load("demo-sites/ridge-waterworks/plan.json");
    const far = structuredClone(plan);
    far.posts[0].position.lonDeg += 0.05; // ≈ 5 km east: the grid grows past the 6 km DEM
    await expect(preparePlan(far, ridgeDem())).rejects.toThrow(/posts\[0\]\.position/);
  });
});
