import { describe, expect, it } from "vitest";
import { buildRadarKernel, kernelFor, type RadarCoverage, Reason } from "../../src/coverage/coverage.ts";
import { computeRadarCoverage, evaluateSite, fuseSiteHeight } from "../../src/coverage/evaluate.ts";
import { cellStatesAtHeight, fuseHeight } from "../../src/coverage/fusion.ts";
import { threeRadarSite } from "./coverageFixtures.ts";

const site = () => threeRadarSite();

/** Cells where two arrays differ (NaN equal to NaN); null arrays equal each other only. */
function differences(a: ArrayLike<number> | null, b: ArrayLike<number> | null): number {
  if (a === null || b === null) return a === b ? 0 : Number.POSITIVE_INFINITY;
  if (a.length !== b.length) return Number.POSITIVE_INFINITY;
  let n = 0;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) n++;
  return n;
}

/** Every array of two radar results, value for value. */
function expectSameCoverage(a: RadarCoverage, b: RadarCoverage): void {
  let n = differences(a.lowestVisibleHeightAglM, b.lowestVisibleHeightAglM);
  a.heights.forEach((h, k) => {
    n += differences(h.snrDbAt0Dbsm, b.heights[k].snrDbAt0Dbsm);
    h.targets.forEach((t, j) => {
      n += differences(t.pd, b.heights[k].targets[j].pd);
      n += differences(t.reason, b.heights[k].targets[j].reason);
    });
  });
  expect(n).toBe(0);
}

describe("radar extents", () => {
  it("[CV10] outside its extent a radar is out of range everywhere; writing it into another radar's result (either nesting) gives the fresh result", () => {
    const s = site();
    const w = s.frame.width;
    const fresh = s.radars.map((_, i) => computeRadarCoverage(s, i));
    const full = fresh[0].extent!;
    expect(full).toEqual({ rowMin: 0, rowMax: 399, colMin: 0, colMax: 399 });
    for (const r of fresh.slice(1)) {
      const e = r.extent!;
      // The staring radars' squares are well inside the grid, so the test exercises the outside.
      expect((e.rowMax - e.rowMin + 1) * (e.colMax - e.colMin + 1)).toBeLessThan(w * w);
      let wrong = 0;
      for (let i = 0; i < w * w; i++) {
        const row = Math.floor(i / w);
        const col = i % w;
        if (row >= e.rowMin && row <= e.rowMax && col >= e.colMin && col <= e.colMax) continue;
        if (!Number.isNaN(r.lowestVisibleHeightAglM[i])) wrong++;
        for (const h of r.heights) {
          if (!Number.isNaN(h.snrDbAt0Dbsm[i])) wrong++;
          for (const t of h.targets) {
            if (t.pd === null) continue;
            if (t.pd[i] !== 0 || t.reason![i] !== Reason.outOfRange) wrong++;
          }
        }
      }
      expect(wrong).toBe(0);
    }
    // Chains of reuse: small into large (outside refilled), large into small (outside kept), small
    // into another small one (squares not nested).
    let held = computeRadarCoverage(s, 1);
    for (const i of [0, 1, 2, 1, 0, 2]) {
      held = computeRadarCoverage(s, i, s.maskMode, held);
      expectSameCoverage(held, fresh[i]);
    }
  });

  it("[CV11] each class and height carries the tight bounds of its Pd > 0 cells, inside the square", () => {
    const s = site();
    const w = s.frame.width;
    let checked = 0;
    for (let i = 0; i < s.radars.length; i++) {
      const r = computeRadarCoverage(s, i);
      for (const h of r.heights)
        for (const t of h.targets) {
          if (t.pd === null) continue;
          const b = t.pdExtent!;
          // By brute force over the whole grid.
          let rowMin = Infinity;
          let rowMax = -Infinity;
          let colMin = Infinity;
          let colMax = -Infinity;
          t.pd.forEach((v, j) => {
            if (!(v > 0)) return;
            const row = Math.floor(j / w);
            const col = j % w;
            rowMin = Math.min(rowMin, row);
            rowMax = Math.max(rowMax, row);
            colMin = Math.min(colMin, col);
            colMax = Math.max(colMax, col);
          });
          if (rowMin === Infinity) expect(b.rowMin > b.rowMax).toBe(true);
          else expect(b).toEqual({ rowMin, rowMax, colMin, colMax });
          const e = r.extent!;
          if (b.rowMin <= b.rowMax)
            expect(
              b.rowMin >= e.rowMin && b.rowMax <= e.rowMax && b.colMin >= e.colMin && b.colMax <= e.colMax,
            ).toBe(true);
          checked++;
        }
    }
    expect(checked).toBeGreaterThan(6);
    // A staring radar's Pd covers its sector, far less than its square.
    const nw = computeRadarCoverage(s, 1).heights[0].targets[0];
    const b = nw.pdExtent!;
    const e = computeRadarCoverage(s, 1).extent!;
    expect((b.rowMax - b.rowMin + 1) * (b.colMax - b.colMin + 1)).toBeLessThan(
      (e.rowMax - e.rowMin + 1) * (e.colMax - e.colMin + 1),
    );
  });

  it("[CV12] a radar moved or raised keeps its kernel; one turned, tilted or judged for other classes gets a new one", () => {
    const s = site();
    const input = (radar = s.radars[1], targets = s.targets) => ({
      radar,
      targets,
      requirement: s.requirement,
      effectiveEarthFactor: s.effectiveEarthFactor,
    });
    const k = kernelFor(input());
    expect(k).toEqual(buildRadarKernel(input()));
    const r = s.radars[1];
    expect(
      kernelFor(input({ ...r, x: r.x + 40, y: r.y - 15, antennaHeightAslM: r.antennaHeightAslM + 5 })),
    ).toBe(k);
    for (const other of [
      input({ ...r, boresightAzDeg: r.boresightAzDeg + 10 }),
      input({ ...r, tiltDeg: r.tiltDeg + 1 }),
      input(r, [s.targets[0]]),
    ]) {
      const k2 = kernelFor(other);
      expect(k2).not.toBe(k);
      expect(k2).toEqual(buildRadarKernel(other));
    }
  });

  it("[FU6] fusion with extents equals fusion over every raster, also into reused arrays", () => {
    const s = site();
    const radars = s.radars.map((_, i) => computeRadarCoverage(s, i));
    const cellState = cellStatesAtHeight(s.ground, s.obstructionTopAglM, 10);
    const pdPerRadar = radars.map((r) => r.heights[0].targets[0].pd!);
    const plain = fuseHeight({ pdPerRadar, requiredPd: 0.8, cellState, regions: s.regions });
    const reused = fuseHeight({
      pdPerRadar: radars.map((r) => r.heights[2].targets[0].pd!),
      requiredPd: 0.8,
      cellState,
      regions: s.regions,
    });
    const withExtents = fuseHeight({
      pdPerRadar,
      requiredPd: 0.8,
      cellState,
      regions: s.regions,
      extents: radars.map((r) => r.extent),
      width: s.frame.width,
      out: reused,
    });
    expect(withExtents.combinedPd).toBe(reused.combinedPd);
    for (const key of ["combinedPd", "overlapCount", "bestRadar", "gap"] as const)
      expect(differences(withExtents[key], plain[key])).toBe(0);
    // The staring radars add coverage the rotating one alone does not give.
    expect(plain.overlapCount.some((c) => c >= 2)).toBe(true);
  });

  it("[EV6] runs into the previous result and fusion steps run by a runner give the figures of a fresh run", async () => {
    const s = site();
    const fresh = await evaluateSite(s);
    const snapshot = JSON.stringify(fresh.targets.map((t) => t.heights.map((h) => h.metrics)));
    const pd = fresh.targets.map((t) => t.heights.map((h) => Array.from(h.combinedPd)));
    const gaps = fresh.targets.map((t) => t.heights.map((h) => Array.from(h.gap)));
    let previous = await evaluateSite(s);
    for (let run = 0; run < 2; run++) {
      const oldCombined = previous.targets[0].heights[0].combinedPd;
      const next = await evaluateSite(s, { previous });
      expect(next.targets[0].heights[0].combinedPd).toBe(oldCombined);
      expect(JSON.stringify(next.targets.map((t) => t.heights.map((h) => h.metrics)))).toBe(snapshot);
      expect(next.targets.map((t) => t.heights.map((h) => Array.from(h.combinedPd)))).toEqual(pd);
      expect(next.targets.map((t) => t.heights.map((h) => Array.from(h.gap)))).toEqual(gaps);
      previous = next;
    }
    const steps: string[] = [];
    const viaRunner = await evaluateSite(s, {
      runFusion: async (site, job) => {
        steps.push(`${job.targetIndex}/${job.heightIndex}`);
        return fuseSiteHeight(site, fresh.radars, job);
      },
    });
    expect(steps).toEqual(["0/0", "0/1", "0/2", "1/1", "1/2"]);
    expect(JSON.stringify(viaRunner.targets.map((t) => t.heights.map((h) => h.metrics)))).toBe(snapshot);
    expect(viaRunner.targets.map((t) => t.heights.map((h) => h.heightAglM))).toEqual([
      [10, 30, 60],
      [30, 60],
    ]);
  });
});
