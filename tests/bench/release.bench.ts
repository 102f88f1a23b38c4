/**
 * A release after a drag, in Node (prints, never asserts): the ridge demo scaled to about 1 million
 * cells with 8 radars and 3 heights, its south gate post moved a little again and again, each move
 * evaluated as the planner does on two workers: part 0 (the shown slice first, then its other slices)
 * and part 1, each with its own coverage API (caches, fusion memo, memory prepared while idle), one
 * after the other in this thread. The browser bench times the same on screen.
 * Run alone: npx tsx tests/bench/release.bench.ts [moves]
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { siteGridFrame } from "../../src/io/siteGrid";
import { createCoverageApi } from "../../src/workers/coverageApi";
import type { EvaluateRequest } from "../../src/workers/protocol";
import { RIDGE_DEMO, scaledRidgePlan } from "./demoPlan";
import { msText } from "./stats";

export async function run(moves = 12): Promise<void> {
  const bytes = readFileSync(join(RIDGE_DEMO, "terrain.tif"));
  const dem = {
    fileName: "terrain.tif",
    bytes: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength),
  };
  const plan = scaledRidgePlan(1e6);
  const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
  const post = plan.posts.findIndex((p) => p.id === "south-gate");
  const g = siteGridFrame(plan);
  console.log(
    `release on ${(g.cellCount / 1e6).toFixed(2)} M cells, 8 radars, 3 heights × 2 classes; ${moves} moves of "${plan.posts[post].name}" (the first after the opening run)`,
  );
  for (const index of [0, 1]) {
    const api = createCoverageApi({ warmWhenIdle: true });
    const first: number[] = [];
    const rest: number[] = [];
    let generation = 0;
    for (let m = 0; m <= moves; m++) {
      const p = structuredClone(plan);
      // A new place each time (no result cached), about 2 m apart on either side of the start, so the
      // grid frame (bounded by the posts) stays the same.
      p.posts[post].position.lonDeg += 0.00003 * ((m + 1) >> 1) * (m % 2 ? 1 : -1);
      const req: EvaluateRequest = {
        generation: ++generation,
        plan: p,
        dem,
        perRadarPostId: null,
        focus,
        sliceFirst: true,
        lowestShown: false,
        // As the page asks while the lowest-height layer is not shown.
        skipLowest: true,
        part: { index, count: 2 },
      };
      let t = performance.now();
      const view = await api.evaluate(req);
      if (m > 0 && view.computedRadarIds?.length !== 1) throw new Error("a move should recompute one radar");
      const a = performance.now() - t;
      let b = 0;
      if (view.partial) {
        t = performance.now();
        await api.evaluate({
          ...req,
          sliceFirst: false,
          shownSliceHeld: true,
          haveTerrainKey: view.terrainKey,
        });
        b = performance.now() - t;
      }
      // The worker's idle time between a release and the next drag (the page says when it settled).
      await api.settled();
      await api.whenIdle();
      if (m === 0) continue;
      first.push(a);
      rest.push(b);
    }
    const steps =
      index === 0 ? `shown slice ${msText(first)}, its other slices ${msText(rest)}` : msText(first);
    console.log(`  part ${index}: ${steps}`);
  }
}

if (process.argv[1]?.endsWith("release.bench.ts")) await run(Number(process.argv[2] ?? 12));
