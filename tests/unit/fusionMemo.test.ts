import { describe, expect, it } from "vitest";
import {
  computeRadarCoverage,
  evaluateSite,
  fuseSiteHeight,
  type PreparedSite,
  radarKey,
} from "../../src/coverage/evaluate.ts";
import { cellStatesAtHeight } from "../../src/coverage/fusion.ts";
import { FusionMemo, type MemoFusionInput } from "../../src/coverage/fusionMemo.ts";
import { RadarResultCache } from "../../src/coverage/radarCache.ts";
import { threeRadarSite } from "./coverageFixtures.ts";

/**
 * The three-radar site (coverageFixtures.ts) with a protected disc and an approach ring around it,
 * so that every count of the metrics is exercised. `nw` and `se`
 * move the staring radars (cells).
 */
function site(nw: [number, number] = [60, 60], se: [number, number] = [330, 300]): PreparedSite {
  const s = threeRadarSite(nw, se);
  const f = s.frame;
  const n = f.width * f.height;
  const pa = new Uint8Array(n);
  const ring = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const d = Math.hypot((i % f.width) - 220, Math.floor(i / f.width) - 190);
    if (d < 90) pa[i] = 1;
    else if (d < 170) ring[i] = 1;
  }
  return { ...s, regions: { protectedArea: pa, approachRing: ring } };
}

/** The memo's input for one class and height of a site (its radars computed afresh). */
function inputOf(s: PreparedSite, t: number, k: number, context = "c"): MemoFusionInput {
  const radars = s.radars.map((_, i) => computeRadarCoverage(s, i));
  const h = s.heightsAglM[k];
  return {
    sliceKey: `${t}/${h}`,
    context,
    radarKeys: s.radars.map((_, i) => radarKey(s, i, s.maskMode)),
    pdPerRadar: radars.map((r) => r.heights[k].targets[t].pd!),
    extents: radars.map((r) => r.extent),
    radarIds: s.radars.map((r) => r.id),
    requiredPd: s.requirement.requiredPd,
    cellState: cellStatesAtHeight(s.ground, s.obstructionTopAglM, h),
    regions: s.regions,
    heightAglM: h,
    grid: s.frame,
  };
}

/** The whole-grid fusion and metrics of the same slice (fuseSiteHeight, no memo). */
function reference(s: PreparedSite, t: number, k: number) {
  const radars = s.radars.map((_, i) => computeRadarCoverage(s, i));
  return fuseSiteHeight(s, radars, { targetIndex: t, heightIndex: k, extents: radars.map((r) => r.extent) });
}

function expectSame(got: ReturnType<FusionMemo["fuse"]>, want: ReturnType<typeof reference>): void {
  expect(got.metrics).toEqual(want.metrics);
  for (const key of ["combinedPd", "overlapCount", "bestRadar", "gap"] as const)
    expect(Array.from(got.fused[key])).toEqual(Array.from(want[key]));
}

describe("fusion memo", () => {
  it("[FM1] after a radar moves, only the rectangle of its old and new squares is fused, with the figures of a whole fusion", () => {
    const memo = new FusionMemo();
    const base = site();
    const first = memo.fuse(inputOf(base, 0, 1));
    expect(first.how).toBe("full");
    expectSame(first, reference(base, 0, 1));
    // Unchanged radars: nothing to do, the kept rasters come back.
    const again = memo.fuse(inputOf(base, 0, 1));
    expect(again.how).toBe("kept");
    expect(again.fused.combinedPd).toBe(first.fused.combinedPd);
    // The north-west radar moves by 10 and then 40 cells; then the south-east one moves too.
    const kinds: boolean[] = [];
    let gapBefore = Array.from(first.fused.gap);
    let versionBefore = first.gapVersion;
    const versionsSeen = new Set([versionBefore]);
    for (const [nw, se] of [
      [
        [70, 60],
        [330, 300],
      ],
      // One cell further: the gap cells (here) stay the same.
      [
        [71, 60],
        [330, 300],
      ],
      [
        [110, 80],
        [330, 300],
      ],
      [
        [110, 80],
        [300, 320],
      ],
    ] as [[number, number], [number, number]][]) {
      const s = site(nw, se);
      const r = memo.fuse(inputOf(s, 0, 1));
      expect(r.how).toBe("window");
      // The window is the staring radars' squares, well inside the grid.
      const w = r.window;
      if (w === undefined) throw new Error("no window");
      expect((w.rowMax - w.rowMin + 1) * (w.colMax - w.colMin + 1)).toBeLessThan(0.8 * 400 * 400);
      expectSame(r, reference(s, 0, 1));
      expect(r.fused.combinedPd).toBe(first.fused.combinedPd);
      // The gap version stays exactly when the gap cells stay; a new one is never an old one.
      const gap = Array.from(r.fused.gap);
      const same = gap.every((v, i) => v === gapBefore[i]);
      if (same) expect(r.gapVersion).toBe(versionBefore);
      else {
        expect(r.gapVersion).not.toBe(versionBefore);
        expect(versionsSeen.has(r.gapVersion)).toBe(false);
      }
      versionsSeen.add(r.gapVersion);
      kinds.push(same);
      gapBefore = gap;
      versionBefore = r.gapVersion;
    }
    // Here the staring radars change Pd only where the rotating one covers already: gaps kept.
    expect(kinds).toEqual([true, true, true, true]);
    // The ring and the disc both hold covered and uncovered cells, and the staring radars cover
    // cells alone, so every count took part.
    const m = reference(site([110, 80], [300, 320]), 0, 1).metrics;
    expect(m.protectedArea.coveredCells).toBeGreaterThan(0);
    expect(m.approachRing.coveredCells).toBeLessThan(m.approachRing.validCells);
    expect(m.perRadar.some((p) => p.onlyThisRadarAreaM2 > 0)).toBe(true);
  });

  it("[FM2] a changed context, radar list or class, or too many changed radars, fuse the whole grid", () => {
    const memo = new FusionMemo(1);
    memo.fuse(inputOf(site(), 1, 2));
    // Another context (terrain, height, regions or requirement).
    const moved = site([70, 60]);
    expect(memo.fuse(inputOf(moved, 1, 2, "other")).how).toBe("full");
    // Two radars changed, more than this memo updates.
    const both = site([80, 60], [320, 300]);
    const r = memo.fuse(inputOf(both, 1, 2, "other"));
    expect(r.how).toBe("full");
    expectSame(r, reference(both, 1, 2));
    // A radar less.
    const fewer: PreparedSite = { ...both, radars: both.radars.slice(0, 2) };
    expect(memo.fuse(inputOf(fewer, 1, 2, "other")).how).toBe("full");
    // A square over most of the grid (the rotating radar moved) is fused whole too.
    const wide: PreparedSite = {
      ...fewer,
      radars: [{ ...fewer.radars[0], x: fewer.radars[0].x + 50 }, fewer.radars[1]],
    };
    const w = memo.fuse(inputOf(wide, 1, 2, "other"));
    expect(w.how).toBe("full");
    expectSame(w, reference(wide, 1, 2));
  });

  it("[FM3] runs of a site through a memo and the radar cache give the figures of fresh runs, slice by slice, and the lowest visible height", async () => {
    const memo = new FusionMemo();
    const cache = new RadarResultCache<ReturnType<typeof computeRadarCoverage>>(16, {
      perGroup: 2,
      spares: 1,
    });
    for (const nw of [
      [60, 60],
      [75, 65],
      [90, 70],
      [60, 60],
    ] as [number, number][]) {
      const s = site(nw);
      const viaMemo = await evaluateSite(s, { cache, fusionMemo: memo });
      const fresh = await evaluateSite(s);
      // The lowest visible height, merged again only where the moved radar reaches.
      expect(Array.from(viaMemo.lowestVisibleHeightAglM)).toEqual(Array.from(fresh.lowestVisibleHeightAglM));
      expect(viaMemo.targets.map((t) => t.heights.map((h) => h.metrics))).toEqual(
        fresh.targets.map((t) => t.heights.map((h) => h.metrics)),
      );
      for (let t = 0; t < fresh.targets.length; t++)
        for (let k = 0; k < fresh.targets[t].heights.length; k++) {
          const a = viaMemo.targets[t].heights[k];
          const b = fresh.targets[t].heights[k];
          expect(Array.from(a.combinedPd)).toEqual(Array.from(b.combinedPd));
          expect(Array.from(a.gap)).toEqual(Array.from(b.gap));
          expect(Array.from(a.overlapCount)).toEqual(Array.from(b.overlapCount));
        }
    }
    // The quadcopter at 3 heights, the fixed wing at 2.
    expect(memo.size).toBe(5);
  });

  it("[FM4] gap cells changed inside the window give a new gap version and components found again", () => {
    const width = 40;
    const height = 30;
    const n = width * height;
    const frame = { width, height, originX: 0, originY: 0, cellSizeM: 10 };
    const regions = { protectedArea: new Uint8Array(n).fill(1), approachRing: new Uint8Array(n) };
    const cellState = new Uint8Array(n);
    // Radar a: Pd 0.9 on the left half. Radar b: Pd `pd` on an 8 × 8 square at (row, col).
    const a = new Float32Array(n);
    for (let i = 0; i < n; i++) if (i % width < 20) a[i] = 0.9;
    const square = (row: number, col: number, pd: number) => {
      const b = new Float32Array(n);
      for (let r = row; r < row + 8; r++) for (let c = col; c < col + 8; c++) b[r * width + c] = pd;
      return { b, extent: { rowMin: row, rowMax: row + 7, colMin: col, colMax: col + 7 } };
    };
    const inputFor = (row: number, col: number, pd: number, key: string): MemoFusionInput => {
      const { b, extent } = square(row, col, pd);
      return {
        sliceKey: "s",
        context: "c",
        radarKeys: ["a", key],
        pdPerRadar: [a, b],
        extents: [undefined, extent],
        radarIds: ["a", "b"],
        requiredPd: 0.8,
        cellState,
        regions,
        heightAglM: 10,
        grid: frame,
      };
    };
    const whole = (input: MemoFusionInput) => new FusionMemo().fuse(input);
    const memo = new FusionMemo();
    const v0 = memo.fuse(inputFor(5, 25, 0.95, "b0")).gapVersion;
    // Another Pd inside the same square, still above the requirement: the same gap cells.
    const same = memo.fuse(inputFor(5, 25, 0.97, "b1"));
    expect(same.how).toBe("window");
    expect(same.gapVersion).toBe(v0);
    expect(same.metrics).toEqual(whole(inputFor(5, 25, 0.97, "b1")).metrics);
    // The square moves into the uncovered half elsewhere: gap cells change, one hole in the gap moves.
    const moved = memo.fuse(inputFor(18, 28, 0.97, "b2"));
    expect(moved.how).toBe("window");
    expect(moved.gapVersion).not.toBe(v0);
    const want = whole(inputFor(18, 28, 0.97, "b2"));
    expect(moved.metrics).toEqual(want.metrics);
    expect(Array.from(moved.fused.gap)).toEqual(Array.from(want.fused.gap));
    // The right half around the square is still one gap.
    expect(moved.metrics.gaps.count).toBe(1);
  });
});
