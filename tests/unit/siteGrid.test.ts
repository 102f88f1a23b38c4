import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  AUTO_CELL_SIZES_M,
  autoCellSizeM,
  cellSizeToFitM,
  checkPlanForRun,
  checkRunMemory,
  DEFAULT_GRID_MARGIN_M,
  estimateRunMemoryBytes,
  MAX_AUTO_CELLS,
  RUN_MEMORY_BUDGET_BYTES,
  runSizeOf,
  SiteGridError,
  siteGridFrame,
  utmZoneOf,
} from "../../src/io/siteGrid.ts";
import { examplePlan as plan, squareAround } from "./siteGridFixtures.ts";

describe("site grid", () => {
  it("[SG1] UTM zones: regular zones, zone edges, hemispheres, Norway and Svalbard exceptions", () => {
    expect(utmZoneOf(15, 60)).toEqual({ zone: 33, south: false });
    expect(utmZoneOf(-180, 0)).toEqual({ zone: 1, south: false });
    expect(utmZoneOf(180, 0)?.zone).toBe(60);
    expect(utmZoneOf(179.999, -5)).toEqual({ zone: 60, south: true });
    expect(utmZoneOf(6, 45)?.zone).toBe(32);
    expect(utmZoneOf(5.999999, 45)?.zone).toBe(31);
    // 32V widened west over Norway (56°–64° N, 3°–12° E).
    expect(utmZoneOf(3.5, 60)?.zone).toBe(32);
    expect(utmZoneOf(3.5, 55.9)?.zone).toBe(31);
    expect(utmZoneOf(3.5, 64)?.zone).toBe(31);
    expect(utmZoneOf(2.9, 60)?.zone).toBe(31);
    // Svalbard: 31X, 33X, 35X, 37X only.
    expect(utmZoneOf(8.9, 78)?.zone).toBe(31);
    expect(utmZoneOf(9, 78)?.zone).toBe(33);
    expect(utmZoneOf(20.9, 78)?.zone).toBe(33);
    expect(utmZoneOf(21, 78)?.zone).toBe(35);
    expect(utmZoneOf(33, 78)?.zone).toBe(37);
    expect(utmZoneOf(42, 78)?.zone).toBe(38);
    expect(utmZoneOf(10, 71.9)?.zone).toBe(32);
    // Outside UTM or not numbers.
    expect(utmZoneOf(10, 84.1)).toBeNull();
    expect(utmZoneOf(10, -80.1)).toBeNull();
    expect(utmZoneOf(Number.NaN, 0)).toBeNull();
  });

  it("[SG2] the frame covers the protected areas, the approach ring, the posts and the margin, on whole cells", () => {
    const p = plan();
    const g = siteGridFrame(p);
    const f = g.frame;
    expect(g.zone).toEqual({ zone: 33, south: false });
    expect(g.epsg).toBe(32633);
    expect(f.crs).toBe("+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs");
    expect(f.originX % f.cellSizeM).toBe(0);
    expect(f.originY % f.cellSizeM).toBe(0);
    const maxX = f.originX + f.width * f.cellSizeM;
    const minY = f.originY - f.height * f.cellSizeM;
    const reach = p.approachRingDepthM + DEFAULT_GRID_MARGIN_M;
    for (const area of p.protectedAreas) {
      const polys =
        area.geometry.type === "Polygon" ? [area.geometry.coordinates] : area.geometry.coordinates;
      for (const ring of polys.flat()) {
        for (const [lon, lat] of ring) {
          const [x, y] = g.toGrid(lon, lat);
          expect(x - reach).toBeGreaterThanOrEqual(f.originX);
          expect(x + reach).toBeLessThanOrEqual(maxX);
          expect(y + reach).toBeLessThanOrEqual(f.originY);
          expect(y - reach).toBeGreaterThanOrEqual(minY);
        }
      }
    }
    // Tight: less than one cell beyond the farthest requirement on each side.
    const pts = p.protectedAreas.flatMap((a) =>
      (a.geometry.type === "Polygon" ? [a.geometry.coordinates] : a.geometry.coordinates)
        .flat(2)
        .map(([lon, lat]) => g.toGrid(lon, lat)),
    );
    for (const post of p.posts) pts.push(g.toGrid(post.position.lonDeg, post.position.latDeg));
    const need = {
      minX: Math.min(...pts.map(([x]) => x)) - reach,
      maxX: Math.max(...pts.map(([x]) => x)) + reach,
      minY: Math.min(...pts.map(([, y]) => y)) - reach,
      maxY: Math.max(...pts.map(([, y]) => y)) + reach,
    };
    expect(need.minX - f.originX).toBeLessThan(f.cellSizeM);
    expect(maxX - need.maxX).toBeLessThan(f.cellSizeM);
    expect(f.originY - need.maxY).toBeLessThan(f.cellSizeM);
    expect(need.minY - minY).toBeLessThan(f.cellSizeM);
  });

  it("[SG2] a post outside the ring widens the frame to include it", () => {
    const base = siteGridFrame(plan());
    const far = siteGridFrame(
      plan((p) => {
        p.posts[0].position = { lonDeg: 16.2, latDeg: 62.35 };
      }),
    );
    const [x, y] = far.toGrid(16.2, 62.35);
    expect(x).toBeLessThanOrEqual(
      far.frame.originX + far.frame.width * far.frame.cellSizeM - DEFAULT_GRID_MARGIN_M,
    );
    expect(y).toBeLessThanOrEqual(far.frame.originY - DEFAULT_GRID_MARGIN_M);
    expect(far.frame.width).toBeGreaterThan(base.frame.width);
    // The zone follows the protected areas only.
    expect(far.zone).toEqual(base.zone);
  });

  it("[SG3] automatic cell size: 5 m when it fits, else the next size that keeps the count under the cap", () => {
    const small = siteGridFrame(plan());
    expect(small.frame.cellSizeM).toBe(5);
    expect(small.autoCellSize).toBe(true);
    const big = siteGridFrame(plan((p) => (p.approachRingDepthM = 20000)));
    expect(big.cellCount).toBeLessThanOrEqual(MAX_AUTO_CELLS);
    const i = AUTO_CELL_SIZES_M.indexOf(big.frame.cellSizeM);
    expect(i).toBeGreaterThan(0);
    // The next smaller size would have exceeded the cap.
    const smaller = AUTO_CELL_SIZES_M[i - 1];
    const spanX = big.frame.width * big.frame.cellSizeM;
    const spanY = big.frame.height * big.frame.cellSizeM;
    expect(
      Math.ceil((spanX - big.frame.cellSizeM) / smaller) * Math.ceil((spanY - big.frame.cellSizeM) / smaller),
    ).toBeGreaterThan(MAX_AUTO_CELLS);
    const fixed = siteGridFrame(plan((p) => (p.analysis.cellSizeM = 2.5)));
    expect(fixed.frame.cellSizeM).toBe(2.5);
    expect(fixed.autoCellSize).toBe(false);
    // The memory budget too: 10 km × 10 km at 5 m is 4 M cells; with one class at 3 heights and 10
    // radars (2.8 GiB) that fits, with three classes (5.0 GiB) it takes 10 m.
    const run = (slices: number) => (cells: number) =>
      estimateRunMemoryBytes({ cells, radars: 10, heights: 3, slices });
    expect(run(3)(4e6) / 1024 ** 3).toBeCloseTo(2.8, 1);
    expect(run(9)(4e6) / 1024 ** 3).toBeCloseTo(5.0, 1);
    expect(autoCellSizeM(10_000, 10_000, run(3))).toBe(5);
    expect(autoCellSizeM(10_000, 10_000, run(9))).toBe(10);
    // On a plan: enough enabled posts push an automatic grid to the next size, and it then fits.
    const many = plan((p) => {
      p.approachRingDepthM = 4_500;
      p.posts = Array.from({ length: 24 }, (_, k) => ({ ...p.posts[0], id: `p${k}`, enabled: true }));
    });
    const at5 = { ...many, analysis: { ...many.analysis, cellSizeM: 5 } };
    // At 5 m the count is under the cap but the run is over the budget.
    expect(siteGridFrame(at5).cellCount).toBeLessThanOrEqual(MAX_AUTO_CELLS);
    expect(checkRunMemory(runSizeOf(at5, siteGridFrame(at5))).ok).toBe(false);
    const g = siteGridFrame(many);
    expect(g.frame.cellSizeM).toBe(10);
    expect(checkRunMemory(runSizeOf(many, g)).ok).toBe(true);
  });

  it("[SG4] southern hemisphere and antimeridian-adjacent sites get their own zone; bad sites are refused", () => {
    const south = siteGridFrame(
      plan((p) => {
        p.protectedAreas = [squareAround(151.2, -33.9, 0.01)];
        p.posts = [];
      }),
    );
    expect(south.frame.crs).toContain("+south");
    expect(south.epsg).toBe(32756);
    const east = siteGridFrame(
      plan((p) => {
        p.protectedAreas = [squareAround(179.9, 10, 0.01)];
        p.posts = [];
      }),
    );
    expect(east.zone.zone).toBe(60);
    expect(() =>
      siteGridFrame(
        plan((p) => {
          p.protectedAreas = [squareAround(179.99, 10, 0.005)];
          p.posts[0].position = { lonDeg: -179.99, latDeg: 10 };
        }),
      ),
    ).toThrow(/antimeridian/);
    const tooBig = () =>
      siteGridFrame(
        plan((p) => {
          p.posts[0].position = { lonDeg: 20, latDeg: 62.3 };
        }),
      );
    expect(tooBig).toThrow(SiteGridError);
    expect(tooBig).toThrow(/km across .* above the 200 km limit/);
  });

  it("[SG5] toGrid and toLonLat are inverse to within 1 mm (property)", () => {
    const g = siteGridFrame(plan());
    fc.assert(
      fc.property(
        fc.double({ min: 15.5, max: 16.5, noNaN: true }),
        fc.double({ min: 62, max: 62.6, noNaN: true }),
        (lon, lat) => {
          const [x, y] = g.toGrid(lon, lat);
          const [lon2, lat2] = g.toLonLat(x, y);
          const [x2, y2] = g.toGrid(lon2, lat2);
          // 1 mm is far below any cell size; proj4's transverse Mercator round trip is at the µm level.
          expect(Math.hypot(x2 - x, y2 - y)).toBeLessThan(1e-3);
        },
      ),
    );
    expect(g.toGrid(Number.NaN, 62)).toEqual([Number.NaN, Number.NaN]);
    expect(g.toLonLat(Number.POSITIVE_INFINITY, 0)).toEqual([Number.NaN, Number.NaN]);
  });

  it("[SG6] the memory estimate follows its formula, and a run above the budget is refused with a clear message", () => {
    // cells × (P·(30 + H) + 13 + (R + 5)·(4P + 4·min(HP, H + P − 1) + 5S) + 23S)
    //   + min(cells, 250 000) × (136 + 13·(R + 4)), P = min(2, S) parts (at least 1).
    const one = (cells: number, radars: number, heights: number) => ({
      cells,
      radars,
      heights,
      slices: heights,
    });
    // No radar: the grid, the page and the preview's own memory.
    expect(estimateRunMemoryBytes(one(1, 0, 0))).toBe(30 + 13 + 136);
    // One part (one slice), one radar: 6 results (4 + 4 + 5 bytes) and its preview results.
    expect(estimateRunMemoryBytes(one(1, 1, 1))).toBe(31 + 13 + 6 * 13 + 23 + (136 + 5 * 13));
    // Three slices on two parts, which share one height's SNR: 2·33 + 13 + 15·(8 + 16 + 15) + 69.
    expect(estimateRunMemoryBytes(one(1000, 10, 3))).toBe(
      1000 * (66 + 13 + 15 * 39 + 69) + 1000 * (136 + 14 * 13),
    );
    // Two classes at each of three heights: six maps, each with its Pd and reason per radar.
    expect(estimateRunMemoryBytes({ cells: 1000, radars: 10, heights: 3, slices: 6 })).toBe(
      1000 * (66 + 13 + 15 * (8 + 16 + 30) + 138) + 1000 * (136 + 14 * 13),
    );
    // Previews of a large grid run on 250 000 cells.
    expect(
      estimateRunMemoryBytes({ cells: 1e6, radars: 10, heights: 3, slices: 6 }) -
        estimateRunMemoryBytes({ cells: 1e6 - 1, radars: 10, heights: 3, slices: 6 }),
    ).toBe(1027);
    expect(estimateRunMemoryBytes(one(-1, 1, 1))).toBeNaN();
    expect(estimateRunMemoryBytes(one(Number.NaN, 1, 1))).toBeNaN();
    expect(estimateRunMemoryBytes({ cells: 1, radars: 1, heights: 1, slices: -1 })).toBeNaN();
    // The design's interactive case fits: 4 M cells, 10 radars, 3 heights, one class.
    expect(checkRunMemory(one(MAX_AUTO_CELLS, 10, 3)).ok).toBe(true);
    const huge = checkRunMemory({ cells: 40_000_000, radars: 10, heights: 3, slices: 6 });
    expect(huge.ok).toBe(false);
    if (!huge.ok) {
      expect(huge.message).toBe(
        "this run needs about 38.33 GiB (40,000,000 cells, 10 radars, 3 heights, 6 maps of a target class at a height), above the 4.00 GiB budget; use a larger analysis.cellSizeM, fewer target heights or classes, or fewer enabled posts",
      );
    }
    expect(checkRunMemory(one(100, 300, 1)).ok).toBe(false);
    expect(checkRunMemory(one(100, 1, 1), 100).ok).toBe(false);
    // Monotone in every count.
    fc.assert(
      fc.property(fc.nat(1e7), fc.nat(50), fc.nat(10), fc.nat(10), (cells, radars, heights, slices) => {
        const b = estimateRunMemoryBytes({ cells, radars, heights, slices });
        expect(estimateRunMemoryBytes({ cells: cells + 1, radars, heights, slices })).toBeGreaterThan(b);
        expect(estimateRunMemoryBytes({ cells, radars: radars + 1, heights, slices })).toBeGreaterThanOrEqual(
          b,
        );
        expect(
          estimateRunMemoryBytes({ cells, radars, heights: heights + 1, slices }),
        ).toBeGreaterThanOrEqual(b);
        expect(estimateRunMemoryBytes({ cells, radars, heights, slices: slices + 1 })).toBeGreaterThanOrEqual(
          b,
        );
      }),
    );
    const p = plan();
    const size = runSizeOf(p, siteGridFrame(p));
    expect(size.radars).toBe(1); // the second post is disabled
    expect(size.heights).toBe(3);
    // Small drone at 10 and 50 m, fixed wing at 50 and 120 m.
    expect(size.slices).toBe(4);
    expect(RUN_MEMORY_BUDGET_BYTES).toBe(4 * 1024 ** 3);
  });

  it("[SG6] checkPlanForRun turns grid and memory refusals into named errors", () => {
    const ok = checkPlanForRun(plan());
    expect(ok.ok && ok.memoryBytes).toBe(
      estimateRunMemoryBytes({ cells: ok.ok ? ok.grid.cellCount : 0, radars: 1, heights: 3, slices: 4 }),
    );
    const fine = checkPlanForRun(
      plan((p) => (p.analysis.cellSizeM = 0.5)),
      1e6,
    );
    expect(fine.ok ? [] : fine.errors.map((e) => e.path)).toEqual(["analysis.cellSizeM"]);
    const far = checkPlanForRun(plan((p) => (p.posts[0].position = { lonDeg: 20, latDeg: 62.3 })));
    // The post that stretches the grid is named by its index, and its message by its name.
    expect(far.ok ? [] : far.errors.map((e) => e.path)).toEqual(["posts[0].position"]);
    expect(far.ok ? "" : far.errors[0].message).toMatch(/post ".+" at 62\.3, 20 lies \d+\.\d km outside/);
  });

  it("[SG6] a refusal can offer the smallest cell size, to the centimetre, at which the run fits", () => {
    const tooFine = plan((p) => (p.analysis.cellSizeM = 0.5));
    const size = (cellSizeM: number) => {
      const q = { ...tooFine, analysis: { ...tooFine.analysis, cellSizeM } };
      return estimateRunMemoryBytes(runSizeOf(q, siteGridFrame(q)));
    };
    expect(size(0.5)).toBeGreaterThan(RUN_MEMORY_BUDGET_BYTES);
    const fit = cellSizeToFitM(tooFine);
    expect(fit).not.toBeNull();
    const c = fit as number;
    expect(Math.round(c * 100)).toBe(c * 100);
    expect(size(c)).toBeLessThanOrEqual(RUN_MEMORY_BUDGET_BYTES);
    // Not much coarser than needed: 1 % finer no longer fits.
    expect(size(Math.floor(c * 0.99 * 100) / 100)).toBeGreaterThan(RUN_MEMORY_BUDGET_BYTES);
    // A plan that fits keeps its cell size; a smaller budget asks for coarser cells.
    const fits = plan((p) => (p.analysis.cellSizeM = 10));
    expect(cellSizeToFitM(fits)).toBe(10);
    expect(
      cellSizeToFitM(fits, estimateRunMemoryBytes(runSizeOf(fits, siteGridFrame(fits))) / 4),
    ).toBeGreaterThan(19.9);
  });
});
