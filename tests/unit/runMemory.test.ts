/**
 * The run memory estimate (siteGrid.ts, rule SG6) against what the engine really keeps: the array
 * buffers two coverage APIs (the planner's two workers, here in one thread) and the page's views hold
 * after an opening run, moves of one post, the memory prepared while idle and a release computed
 * ahead. Measured with Node's count of live ArrayBuffer bytes after a full collection.
 */
import v8 from "node:v8";
import vm from "node:vm";
import { describe, expect, it } from "vitest";
import type { Plan } from "../../src/io/planSchema";
import { estimateRunMemoryBytes, runSizeOf, siteGridFrame } from "../../src/io/siteGrid";
import { createCoverageApi } from "../../src/workers/coverageApi";
import type { CoverageView, EvaluateRequest } from "../../src/workers/protocol";
import { ridgeDemoDem, ridgeDemoPlan } from "../dom/ridgeDemo";

v8.setFlagsFromString("--expose-gc");
const collect = vm.runInNewContext("gc") as () => void;

function liveArrayBytes(): number {
  collect();
  collect();
  return process.memoryUsage().arrayBuffers;
}

/** The demo at 5 m cells (about 200 000 cells): the rasters outweigh the DEM file and the code's own buffers. */
function finePlan(): Plan {
  const plan = ridgeDemoPlan();
  return { ...plan, analysis: { ...plan.analysis, cellSizeM: 5 } };
}

function movedBy(plan: Plan, postId: string, k: number): Plan {
  const m: Plan = structuredClone(plan);
  const post = m.posts.find((p) => p.id === postId);
  if (!post) throw new Error(`no post ${postId}`);
  post.position.lonDeg += 0.00002 * k;
  return m;
}

describe("run memory", () => {
  it("[SG6] the estimate holds what the workers and the page keep through moves, idle work and a release computed ahead, and is not far above it", async () => {
    const plan = finePlan();
    const grid = siteGridFrame(plan);
    const estimate = estimateRunMemoryBytes(runSizeOf(plan, grid));
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[0] };
    const before = liveArrayBytes();
    const workers = [createCoverageApi({ warmWhenIdle: true }), createCoverageApi({ warmWhenIdle: true })];
    let generation = 0;
    // The page keeps the newest view of each part (the one-radar layer shows the moved post).
    let held: CoverageView[] = [];
    const run = async (p: Plan, extra: Partial<EvaluateRequest> = {}) => {
      generation++;
      const views: CoverageView[] = [];
      for (const [index, api] of workers.entries()) {
        const req: EvaluateRequest = {
          generation,
          plan: p,
          dem: ridgeDemoDem(),
          perRadarPostId: "south-gate",
          focus,
          lowestShown: true,
          part: { index, count: workers.length },
          ...extra,
        };
        views.push(await api.evaluate(req));
      }
      return views;
    };
    for (let k = 0; k <= 4; k++) {
      const views = await run(movedBy(plan, "south-gate", k));
      if (k > 0) expect(views.map((v) => v.computedRadarIds)).toEqual([["south-gate"], ["south-gate"]]);
      held = views;
      for (const api of workers) {
        await api.settled();
        await api.whenIdle();
      }
    }
    // A drag of another post: previews on the second worker (the page keeps the last three), then it
    // rests, and its release is computed ahead.
    const mid = liveArrayBytes() - before;
    const previews: CoverageView[] = [];
    for (let k = 1; k <= 6; k++) {
      previews.push(
        await workers[1].evaluate({
          generation: ++generation,
          plan: movedBy(plan, "east-fence", k),
          dem: ridgeDemoDem(),
          perRadarPostId: "east-fence",
          focus,
          maskMode: "fast",
        }),
      );
      if (previews.length > 3) previews.shift();
    }
    const withPreviews = liveArrayBytes() - before;
    await run(movedBy(plan, "east-fence", 3), { cacheOnly: true });
    const kept = liveArrayBytes() - before;
    // Each step kept memory of its own: the previews' results and the result computed ahead.
    expect(withPreviews).toBeGreaterThan(mid);
    expect(kept).toBeGreaterThan(withPreviews);
    expect(held).toHaveLength(2);
    expect(previews).toHaveLength(3);
    expect(kept).toBeLessThanOrEqual(estimate);
    expect(kept).toBeGreaterThan(0.75 * estimate);
  });
});
