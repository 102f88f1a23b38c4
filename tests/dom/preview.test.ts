import { describe, expect, it } from "vitest";
import { evaluateSite } from "../../src/coverage/evaluate";
import type { Plan } from "../../src/io/planSchema";
import { preparePlan } from "../../src/io/preparePlan";
import { siteGridFrame } from "../../src/io/siteGrid";
import { planKeyWithoutPlacement, previewSite } from "../../src/workers/preview";
import { ridgeDemoPlan as demoPlan, ridgeDemoDem } from "./ridgeDemo";

async function prepared(plan: Plan) {
  const { fileName, bytes } = ridgeDemoDem();
  return preparePlan(plan, { fileName, data: bytes });
}

describe("re-placing moved posts on the prepared site", () => {
  it("places a moved and turned ground post exactly as preparePlan does, with the same results", async () => {
    const plan = demoPlan();
    const last = await prepared(plan);
    // A ground post well inside the grid, so that moving it leaves the grid frame as it is.
    const frame = JSON.stringify(siteGridFrame(plan).frame);
    const moveBy = (p: Plan, k: number) => {
      const m: Plan = structuredClone(p);
      m.posts[k].position.lonDeg += 0.0004;
      m.posts[k].position.latDeg -= 0.0003;
      return m;
    };
    const i = plan.posts.findIndex(
      (p, k) =>
        p.enabled &&
        p.mounting === "ground" &&
        JSON.stringify(siteGridFrame(moveBy(plan, k)).frame) === frame,
    );
    expect(i).toBeGreaterThanOrEqual(0);
    const moved = moveBy(plan, i);
    moved.posts[i].boresightAzDeg = (moved.posts[i].boresightAzDeg + 40) % 360;
    moved.posts[i].tiltDeg = 2;
    expect(planKeyWithoutPlacement(moved)).toBe(planKeyWithoutPlacement(plan));
    const quick = previewSite(moved, last, false);
    if (!quick) throw new Error("the move should be re-placed");
    expect(quick.movedIds).toEqual([moved.posts[i].id]);
    const full = await prepared(moved);
    expect(quick.site.radars).toEqual(full.site.radars);
    const [a, b] = await Promise.all([evaluateSite(quick.site), evaluateSite(full.site)]);
    expect(a.targets.map((t) => t.heights.map((h) => h.metrics))).toEqual(
      b.targets.map((t) => t.heights.map((h) => h.metrics)),
    );
  });

  it("leaves a moved roof post to preparePlan in accurate runs, and a changed model always", async () => {
    const plan = demoPlan();
    const last = await prepared(plan);
    const roof = plan.posts.findIndex((p) => p.enabled && p.mounting === "roof");
    const moved: Plan = structuredClone(plan);
    moved.posts[roof].position.lonDeg += 0.0001;
    expect(previewSite(moved, last, false)).toBeNull();
    expect(previewSite(moved, last, true)).not.toBeNull();
    const other: Plan = structuredClone(plan);
    other.posts[roof].mastHeightM += 1;
    expect(planKeyWithoutPlacement(other)).not.toBe(planKeyWithoutPlacement(plan));
  });
});
