import { describe, expect, it } from "vitest";
import { Reason } from "../../src/coverage/coverage.ts";
import { CancelledError, evaluatePoint, evaluateSite } from "../../src/coverage/evaluate.ts";
import { CellState } from "../../src/coverage/fusion.ts";
import {
  cellXY,
  demoRadar,
  fixedWing,
  frameOf,
  placed,
  quad,
  roughGround,
  siteOf,
} from "./coverageFixtures.ts";

function site() {
  const f = frameOf(200, 200, 5);
  const ground = roughGround(f);
  const top = new Float32Array(f.width * f.height);
  // A 20 m block of buildings in the middle.
  for (let r = 90; r < 110; r++) for (let c = 90; c < 110; c++) top[r * f.width + c] = 20;
  const m = demoRadar("mossbee-58");
  return siteOf(
    f,
    ground,
    [
      placed(m, cellXY(f, 30, 30), 150, { id: "nw", boresightAzDeg: 135, tiltDeg: -5 }),
      placed(m, cellXY(f, 170, 170), 150, { id: "se", boresightAzDeg: 315, tiltDeg: -5 }),
    ],
    { top, targets: [quad, fixedWing] },
  );
}

describe("evaluateSite", () => {
  it("[EV1] classes are judged at their own heights; fused figures add up; inside-obstruction cells are left out", async () => {
    const s = site();
    const res = await evaluateSite(s);
    expect(res.targets.map((t) => t.heights.map((h) => h.heightAglM))).toEqual([
      [10, 30, 60],
      [30, 60],
    ]);
    const h10 = res.targets[0].heights[0];
    const m = h10.metrics;
    expect(m.protectedArea.cells).toBe(200 * 200);
    expect(m.protectedArea.insideObstructionCells).toBe(400);
    expect(res.targets[0].heights[1].metrics.protectedArea.insideObstructionCells).toBe(0);
    expect(m.protectedArea.validCells + m.protectedArea.insideObstructionCells).toBe(m.protectedArea.cells);
    expect(m.overlapHistogram.reduce((a, b) => a + b, 0)).toBe(m.protectedArea.validCells);
    expect(m.gaps.totalAreaM2).toBeCloseTo(
      (m.protectedArea.validCells - m.protectedArea.coveredCells) * 25,
      6,
    );
    for (let i = 0; i < h10.cellState.length; i++)
      if (h10.cellState[i] === CellState.insideObstruction) expect(h10.gap[i]).toBe(0);
    // The per-radar rasters give the fused Pd.
    const pdA = res.radars[0].heights[0].targets[0].pd!;
    const pdB = res.radars[1].heights[0].targets[0].pd!;
    const i = 100 * 200 + 40;
    expect(h10.combinedPd[i]).toBeCloseTo(1 - (1 - pdA[i]) * (1 - pdB[i]), 6);
    // The larger class covers at least as much as the small one at the same height.
    expect(res.targets[1].heights[0].metrics.protectedArea.coveredFraction).toBeGreaterThanOrEqual(
      res.targets[0].heights[1].metrics.protectedArea.coveredFraction,
    );
  });

  it("leaves the lowest visible height out when asked, and nothing else changes", async () => {
    const s = site();
    const full = await evaluateSite(s);
    const without = await evaluateSite(s, { lowestVisible: false });
    expect(without.lowestVisibleHeightAglM.length).toBe(0);
    expect(full.lowestVisibleHeightAglM.length).toBe(s.frame.width * s.frame.height);
    for (const [t, target] of full.targets.entries())
      for (const [k, h] of target.heights.entries()) {
        const other = without.targets[t].heights[k];
        expect(other.metrics).toEqual(h.metrics);
        expect(Array.from(other.combinedPd)).toEqual(Array.from(h.combinedPd));
      }
  });

  it("[EV2] progress is reported per radar and per fusion step; a cancel stops the run with CancelledError", async () => {
    const s = site();
    const seen: string[] = [];
    await evaluateSite(s, { onProgress: (p) => seen.push(`${p.stage}:${p.done}/${p.total}`) });
    expect(seen).toContain("radars:2/2");
    expect(seen).toContain("fusion:5/5");
    await expect(evaluateSite(s, { shouldCancel: () => true })).rejects.toBeInstanceOf(CancelledError);
    await expect(evaluateSite(s, { signal: { aborted: true } })).rejects.toMatchObject({
      name: "CancelledError",
    });
  });

  it("[EV3] evaluatePoint agrees with the raster at the same cell (Pd within 0.02 away from masking edges)", async () => {
    const s = site();
    const res = await evaluateSite(s);
    let checked = 0;
    for (const [col, row] of [
      [60, 60],
      [80, 40],
      [140, 120],
      [100, 150],
      [50, 170],
    ]) {
      const [x, y] = cellXY(s.frame, col, row);
      const p = evaluatePoint(s, { x, y }, 30);
      const i = row * s.frame.width + col;
      for (let r = 0; r < 2; r++) {
        const row0 = p.rows.find((q) => q.radarId === s.radars[r].id && q.targetId === "quad")!;
        const rasterPd = res.radars[r].heights[1].targets[0].pd![i];
        const rasterReason = res.radars[r].heights[1].targets[0].reason![i];
        // The point uses the exact ray march, the raster the accurate sweep: they agree off masking edges.
        if (rasterReason === Reason.masked || row0.reason === Reason.masked) continue;
        expect(Math.abs(row0.pdTable - rasterPd)).toBeLessThan(0.02);
        expect(row0.reason).toBe(rasterReason);
        if (Number.isFinite(row0.snrDb))
          expect(row0.linkBudget.rows.at(-1)!.valueDb).toBeCloseTo(row0.snrDb, 6);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(4);
    expect(() => evaluatePoint(s, { x: 0, y: 0 }, 30)).toThrow(/outside the site grid/);
    const [x5, y5] = cellXY(s.frame, 5, 5);
    expect(() => evaluatePoint(s, { x: x5, y: y5 }, -5)).toThrow(/heightAglM/);
  });
});

describe("cancel between radars", () => {
  it("[EV4] a cancel raised while the first radar runs stops the run before the second (inline runner)", async () => {
    const s = site();
    let cancel = false;
    const progress: number[] = [];
    const run = evaluateSite(s, {
      shouldCancel: () => cancel,
      onProgress: (p) => {
        if (p.stage === "radars") progress.push(p.done);
        if (p.stage === "radars" && p.done === 1) cancel = true;
      },
    });
    await expect(run).rejects.toBeInstanceOf(CancelledError);
    expect(progress).toEqual([0, 1]);
  });
});

describe("re-evaluation into a previous result", () => {
  it("[EV5] with `previous`, each radar writes into its old arrays and the fused result is unchanged", async () => {
    const s = site();
    const first = await evaluateSite(s);
    const pdBefore = Array.from(first.targets[0].heights[0].combinedPd);
    const oldArray = first.radars[1].heights[0].targets[0].pd;
    const moved = { ...s, radars: s.radars.map((r, i) => (i === 1 ? { ...r, tiltDeg: 2 } : r)) };
    const second = await evaluateSite(moved, { previous: first });
    expect(second.radars[1].heights[0].targets[0].pd).toBe(oldArray);
    const fresh = await evaluateSite(moved);
    expect(Array.from(second.targets[0].heights[0].combinedPd)).toEqual(
      Array.from(fresh.targets[0].heights[0].combinedPd),
    );
    const back = await evaluateSite(s, { previous: second });
    expect(Array.from(back.targets[0].heights[0].combinedPd)).toEqual(pdBefore);
  });
});
