/** The ridge demo plan scaled for the benchmarks (prints nothing, asserts nothing). */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Plan } from "../../src/io/planSchema";
import { siteGridFrame } from "../../src/io/siteGrid";

export const RIDGE_DEMO = join(import.meta.dirname, "../../demo-sites/ridge-waterworks");

/** The ridge demo with its cell size chosen for about `targetCells` cells and its first 8 posts on. */
export function scaledRidgePlan(targetCells: number): Plan {
  const plan = JSON.parse(readFileSync(join(RIDGE_DEMO, "plan.json"), "utf8")) as Plan;
  const g = siteGridFrame({ ...plan, analysis: { ...plan.analysis, cellSizeM: 10 } });
  const cell = Math.sqrt((g.frame.width * g.frame.height * 100) / targetCells);
  plan.analysis = { ...plan.analysis, cellSizeM: Math.round(cell * 100) / 100 };
  let enabled = 0;
  plan.posts = plan.posts.map((p) => ({ ...p, enabled: enabled++ < 8 }));
  return plan;
}
