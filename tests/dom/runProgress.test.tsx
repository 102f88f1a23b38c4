// @vitest-environment jsdom
/**
 * Progress of an accurate run: the worker API reports radars then fusion steps, the engine's tracker
 * turns the parts' reports into one fraction that never goes back, and the top bar shows it.
 */
import { act } from "react";
import { createRoot } from "react-dom/client";
import { describe, expect, it } from "vitest";
import { TopBar } from "../../src/ui/components/TopBar";
import { useCoverage } from "../../src/ui/coverageState";
import { RunProgressTracker } from "../../src/ui/runParts";
import { createCoverageApi } from "../../src/workers/coverageApi";
import { PROGRESS_INTERVAL_MS } from "../../src/workers/progressThrottle";
import type { RunProgress } from "../../src/workers/protocol";
import { ridgeDemoDem, ridgeDemoPlan } from "./ridgeDemo";

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

describe("run progress", () => {
  it("the worker API reports radars, then fusion steps, at most one report per 100 ms", async () => {
    const plan = ridgeDemoPlan();
    const dem = ridgeDemoDem();
    const seen: { p: RunProgress; at: number }[] = [];
    const t0 = performance.now();
    await createCoverageApi().evaluate({ generation: 1, plan, dem }, (p) =>
      seen.push({ p, at: performance.now() }),
    );
    const enabled = plan.posts.filter((p) => p.enabled).length;
    const slices = plan.targetClasses.reduce((n, t) => n + t.heightsAglM.length, 0);
    // Every report passed on came at least PROGRESS_INTERVAL_MS after the run started and after the
    // one before (progressThrottle.ts); the demo's run is long enough to give some.
    expect(seen.length).toBeGreaterThan(0);
    for (const [k, s] of seen.entries())
      expect(s.at - (k === 0 ? t0 : seen[k - 1].at)).toBeGreaterThanOrEqual(PROGRESS_INTERVAL_MS - 1);
    // Radars first, then fusion; counts never go back and stay within their totals.
    const stages = seen.map((s) => s.p.stage);
    const firstFusion = stages.indexOf("fusion");
    if (firstFusion >= 0) expect(stages.slice(firstFusion).every((s) => s === "fusion")).toBe(true);
    for (const [stage, total] of [
      ["radars", enabled],
      ["fusion", slices],
    ] as const) {
      const done = seen.filter((s) => s.p.stage === stage).map((s) => s.p.done);
      expect(seen.filter((s) => s.p.stage === stage).every((s) => s.p.total === total)).toBe(true);
      expect(done).toEqual([...done].sort((a, b) => a - b));
      expect(done.every((d) => d >= 0 && d <= total)).toBe(true);
    }
  });

  it("the tracker averages the parts, never goes back, and counts a finished part whole", () => {
    const out: number[] = [];
    const t = new RunProgressTracker(2, (f) => out.push(f));
    t.report(0, { stage: "radars", done: 4, total: 8 }); // part 0: 0.8 × 4/8 = 0.4
    expect(t.fraction()).toBeCloseTo(0.2, 12);
    t.report(1, { stage: "radars", done: 8, total: 8 }); // part 1: 0.8
    t.report(1, { stage: "fusion", done: 1, total: 2 }); // part 1: 0.8 + 0.2 × 1/2 = 0.9
    expect(t.fraction()).toBeCloseTo((0.4 + 0.9) / 2, 12);
    t.report(1, { stage: "radars", done: 0, total: 8 }); // a second step starts again: ignored
    expect(t.fraction()).toBeCloseTo((0.4 + 0.9) / 2, 12);
    t.finish(0);
    t.finish(1);
    expect(t.fraction()).toBe(1);
    expect(out.every((f, i) => i === 0 || f >= out[i - 1])).toBe(true);
  });

  it("the top bar shows the fraction while a run is under way", async () => {
    const el = document.createElement("div");
    document.body.append(el);
    const root = createRoot(el);
    await act(async () => {
      useCoverage.getState().set({ running: true, progress: 0.42 });
      root.render(<TopBar onAbout={() => undefined} mapCentre={() => [0, 0]} />);
    });
    expect(el.querySelector('[data-testid="run-status"]')?.textContent).toBe("Computing… 42 %");
    expect((el.querySelector("progress") as HTMLProgressElement).value).toBeCloseTo(0.42, 6);
    await act(async () => useCoverage.getState().set({ running: false, progress: null }));
    expect(el.querySelector("progress")).toBeNull();
    await act(async () => root.unmount());
  });
});
