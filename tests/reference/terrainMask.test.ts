/**
 * Masking sweeps against the exact ray march (R3, every grid-line crossing of every sight line) and
 * against closed-form geometry: a wall (similar triangles), a smooth sphere (hidden height
 * (d − d_h)²/(2ka), d_h = √(2kaH), the radio-horizon formula of ITU-R P.526 / common practice).
 * Rules TM1–TM8 in docs/model-spec.md.
 */

import { describe, expect, it } from "vitest";
import { EARTH_RADIUS_M } from "../../src/coverage/constants.ts";
import type { Grid } from "../../src/coverage/grid.ts";
import { rayMarchCell, rayMarchHorizon } from "../../src/coverage/rayMarch.ts";
import {
  computeHorizon,
  type HorizonResult,
  lowestVisibleHeightAglM,
  type MaskInput,
  type MaskMode,
  ObserverOutsideGridError,
  visibleMask,
} from "../../src/coverage/terrainMask.ts";
import { prng, syntheticDem } from "../fixtures/viewshed/syntheticDem.ts";

const CRS = "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs";
const K = 4 / 3;

function grid(
  width: number,
  height: number,
  cellSizeM: number,
  fill: (c: number, r: number) => number,
): Grid {
  const data = new Float32Array(width * height);
  for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) data[r * width + c] = fill(c, r);
  return { data, width, height, originX: 0, originY: 0, cellSizeM, crs: CRS };
}

/** Input for an observer at the centre of cell (col, row), antenna `aglM` above that cell's surface. */
function inputAt(surface: Grid, col: number, row: number, aglM: number, mode: MaskMode, k = K): MaskInput {
  return {
    surface,
    observerX: surface.originX + (col + 0.5) * surface.cellSizeM,
    observerY: surface.originY - (row + 0.5) * surface.cellSizeM,
    antennaHeightAslM: surface.data[row * surface.width + col] + aglM,
    effectiveEarthFactor: k,
    mode,
  };
}

function quantile(values: number[], p: number): number {
  const v = [...values].sort((a, b) => a - b);
  return v[Math.min(v.length - 1, Math.floor(p * v.length))];
}

/** |lowest visible height − R3's| over the listed cells, m; also counts NaN disagreements. */
function errorsVsExact(
  input: MaskInput,
  ground: Grid,
  cells: number[],
): { errs: number[]; nanMismatch: number } {
  const exact = lowestVisibleHeightAglM(rayMarchHorizon(input, cells), ground, input);
  const ours = lowestVisibleHeightAglM(computeHorizon(input), ground, input);
  const errs: number[] = [];
  let nanMismatch = 0;
  for (const i of cells) {
    if (Number.isNaN(ours[i]) !== Number.isNaN(exact[i])) nanMismatch++;
    else if (!Number.isNaN(ours[i])) errs.push(Math.abs(ours[i] - exact[i]));
  }
  return { errs, nanMismatch };
}

function allCells(g: Grid): number[] {
  return Array.from({ length: g.width * g.height }, (_, i) => i);
}

describe("[TM7] accurate mode against the exact ray march (R3)", () => {
  it("[TM7] rough terrain with buildings, 1024² cells of 10 m, out to 10 km: p90 ≤ 0.5 m, p99 ≤ 2.5 m", () => {
    const dem = syntheticDem({ width: 1024, height: 1024, cellSizeM: 10, seed: 7, ridgeM: 60 });
    // Observer off-centre so that sight lines reach 10 km inside the grid.
    const input = { ...inputAt(dem.surface, 300, 360, 15, "accurate"), maxRangeM: 10_000 };
    const rand = prng(3);
    const cells: number[] = [];
    for (let i = 0; i < 60_000; i++) cells.push(Math.floor(rand() * 1024 * 1024));
    const { errs, nanMismatch } = errorsVsExact(input, dem.ground, cells);
    const p90 = quantile(errs, 0.9);
    const p99 = quantile(errs, 0.99);
    const fast = errorsVsExact({ ...input, mode: "fast" }, dem.ground, cells);
    console.log(
      `[TM7] lowest visible height |error| vs R3 (m): accurate p90 ${p90.toFixed(3)} p99 ${p99.toFixed(3)}; ` +
        `fast p90 ${quantile(fast.errs, 0.9).toFixed(3)} p99 ${quantile(fast.errs, 0.99).toFixed(3)}`,
    );
    expect(nanMismatch).toBe(0);
    expect(errs.length).toBeGreaterThan(50_000);
    expect(p90).toBeLessThanOrEqual(0.5);
    expect(p99).toBeLessThanOrEqual(2.5);
  });

  it("[TM3] a straight ridge 8 km out: the shadow behind it matches R3 and the curved-earth geometry", () => {
    // Flat ground at 100 m, a 3-cell-wide ridge at 180 m across the grid at x = 8 km, antenna 20 m up.
    const g = grid(1200, 200, 10, (c) => (c >= 800 && c < 803 ? 180 : 100));
    const input = inputAt(g, 0, 100, 20, "accurate");
    const h = computeHorizon(input);
    const lv = lowestVisibleHeightAglM(h, g, input);
    const curv = 1 / (2 * K * EARTH_RADIUS_M);
    for (const [c, r] of [
      [850, 100],
      [1000, 130],
      [1199, 60],
      [1199, 199],
    ]) {
      // The ridge's steepest point is its near face top at x = 8 km along the ray (s = 800/c of d):
      // LVH = H + d²·c + d·((Hr − H)/s − s·c) − ground (rule TM1 and TM5 geometry).
      const d = Math.hypot(c, r - 100) * 10;
      const s = (800 / c) * d;
      const expected = 120 + d * d * curv + d * ((180 - 120) / s - s * curv) - 100;
      expect(Math.abs(lv[r * 1200 + c] - expected)).toBeLessThanOrEqual(0.05);
      const exact = rayMarchCell(input, c, r);
      expect(Math.abs(exact.slope - h.horizonSlope[r * 1200 + c]) * d).toBeLessThanOrEqual(0.05);
      expect(Math.abs(exact.obstacleDistanceM - s)).toBeLessThanOrEqual(1);
    }
  });

  it("[TM7] a cliff: plateau 60 m above the observer's plain, both sides agree with R3", () => {
    const g = grid(200, 160, 10, (c, r) => (c + 0.3 * r > 120 ? 260 : 200 + 0.01 * c));
    const input = inputAt(g, 40, 80, 10, "accurate");
    const { errs } = errorsVsExact(input, g, allCells(g));
    expect(quantile(errs, 0.9)).toBeLessThanOrEqual(0.5);
    expect(quantile(errs, 0.99)).toBeLessThanOrEqual(2.5);
    // The cliff face is seen; the plateau well behind its edge is not, at 0 m.
    const vis = visibleMask(computeHorizon(input), g, input, 0);
    expect(vis[80 * 200 + 97]).toBe(1); // first plateau cell on the observer's row (face top)
    expect(vis[80 * 200 + 150]).toBe(0);
  });

  it("[TM7] a tall thin building (1 cell, 80 m): its shadow matches R3 and similar triangles", () => {
    const g = grid(160, 120, 5, () => 100);
    g.data[60 * 160 + 60] = 180;
    const input = inputAt(g, 20, 60, 10, "accurate", Number.POSITIVE_INFINITY);
    const h = computeHorizon(input);
    const lv = lowestVisibleHeightAglM(h, g, input);
    // On the axis behind the tower: LVH = Ha + (Ht − Ha)·x_t/x_w (flat earth, similar triangles).
    for (const c of [70, 100, 150]) {
      const expected = 10 + (80 - 10) * ((c - 20) / 40);
      expect(Math.abs(lv[60 * 160 + c] - expected)).toBeLessThanOrEqual(0.05);
      expect(Math.abs(rayMarchCell(input, c, 60).slope - h.horizonSlope[60 * 160 + c])).toBeLessThan(1e-5);
    }
    const exact = visibleMask(rayMarchHorizon(input), g, input, 0);
    const ours = visibleMask(h, g, input, 0);
    let same = 0;
    for (let i = 0; i < ours.length; i++) if (ours[i] === exact[i]) same++;
    expect(same / ours.length).toBeGreaterThanOrEqual(0.995);
  });

  it("[TM2] observer on a roof: the roof edge hides the street next to the building unless it is the radar's footprint", () => {
    // 12×12-cell building (30 m) on flat ground; antenna 2 m above the roof at its centre.
    const g = grid(120, 120, 5, (c, r) => (c >= 54 && c < 66 && r >= 54 && r < 66 ? 130 : 100));
    const input = inputAt(g, 60, 60, 2, "accurate");
    const street = 60 * 120 + 68; // 2 cells east of the building
    const onRoof = lowestVisibleHeightAglM(computeHorizon(input), g, input);
    expect(onRoof[street]).toBeGreaterThan(10);
    expect(
      Math.abs(onRoof[street] - lowestVisibleHeightAglM(rayMarchHorizon(input, [street]), g, input)[street]),
    ).toBeLessThan(0.05);
    // Declaring the roof the radar's own footprint (radius 45 m covers it) removes that mask.
    const own = { ...input, ownFootprintRadiusM: 45 };
    const lvOwn = lowestVisibleHeightAglM(computeHorizon(own), g, own);
    expect(lvOwn[street]).toBe(0);
    expect(lowestVisibleHeightAglM(computeHorizon({ ...own, mode: "fast" }), g, own)[street]).toBe(0);
    // The observer's own cell never masks, even with the antenna below its surface (inside a tower).
    const tower = grid(40, 40, 5, (c, r) => (c === 20 && r === 20 ? 200 : 100));
    const inside = { ...inputAt(tower, 20, 20, 0, "accurate"), antennaHeightAslM: 110 };
    for (const mode of ["accurate", "fast"] as const) {
      const vis = visibleMask(computeHorizon({ ...inside, mode }), tower, inside, 0);
      expect(vis.every((v) => v === 1)).toBe(true);
    }
  });

  it("[TM8] observer at the DEM edge and in a corner agree with R3; outside the DEM is refused by name", () => {
    const dem = syntheticDem({ width: 256, height: 200, cellSizeM: 10, seed: 5 });
    for (const [c, r] of [
      [0, 100],
      [255, 0],
      [128, 199],
    ]) {
      const input = inputAt(dem.surface, c, r, 12, "accurate");
      const { errs, nanMismatch } = errorsVsExact(input, dem.ground, allCells(dem.surface));
      expect(nanMismatch).toBe(0);
      expect(quantile(errs, 0.9)).toBeLessThanOrEqual(0.5);
      expect(quantile(errs, 0.99)).toBeLessThanOrEqual(2.5);
    }
    const outside = { ...inputAt(dem.surface, 0, 0, 10, "accurate"), observerX: -1 };
    expect(() => computeHorizon(outside)).toThrow(ObserverOutsideGridError);
    try {
      computeHorizon({ ...outside, mode: "fast" });
    } catch (e) {
      expect((e as Error).name).toBe("ObserverOutsideGridError");
      expect((e as Error).message).toMatch(/outside the surface grid/);
    }
  });
});

describe("[TM1] curvature: flat earth against the smooth sphere", () => {
  // A strip 45 km long of flat sea-level ground, 40 m cells; antenna 30 m.
  const g = grid(1130, 3, 40, () => 0);
  for (const mode of ["accurate", "fast"] as const) {
    it(`[TM1] ${mode}: flat earth sees all the flat ground; k = 4/3 hides (d − d_h)²/(2ka) beyond the horizon`, () => {
      const flat = inputAt(g, 0, 1, 30, mode, Number.POSITIVE_INFINITY);
      expect(visibleMask(computeHorizon(flat), g, flat, 0).every((v) => v === 1)).toBe(true);
      const curved = inputAt(g, 0, 1, 30, mode, K);
      const h: HorizonResult = computeHorizon(curved);
      const lv = lowestVisibleHeightAglM(h, g, curved);
      const c = 1 / (2 * K * EARTH_RADIUS_M);
      const horizonM = Math.sqrt(30 / c); // d_h = √(2·k·a·H), about 22.6 km
      for (const col of [300, 560, 800, 1000, 1129]) {
        const d = col * 40;
        const expected = d < horizonM ? 0 : c * (d - horizonM) ** 2;
        // The grid samples every 40 m near the tangent point, where the horizon slope is flat to second
        // order: the discrete maximum is within (20 m)²·c·... of the true one, far below 1 cm.
        expect(Math.abs(lv[1 * 1130 + col] - expected)).toBeLessThanOrEqual(0.01);
      }
      expect(lv[1 * 1130 + 1129]).toBeGreaterThan(15);
    });
  }
});

describe("[TM5] nodata and range", () => {
  it("[TM5] nodata is never visible and a nodata obstruction is skipped; beyond maxRangeM stays NaN", () => {
    const g = grid(60, 40, 10, () => 100);
    for (let r = 0; r < 40; r++) g.data[r * 60 + 30] = Number.NaN; // a nodata column
    for (const mode of ["accurate", "fast"] as const) {
      const input = { ...inputAt(g, 10, 20, 5, mode), maxRangeM: 400 };
      const h = computeHorizon(input);
      const vis = visibleMask(h, g, input, 0);
      const lv = lowestVisibleHeightAglM(h, g, input);
      expect(vis[20 * 60 + 30]).toBe(0);
      expect(Number.isNaN(lv[20 * 60 + 30])).toBe(true);
      expect(vis[20 * 60 + 35]).toBe(1); // flat ground behind the nodata column is still seen
      expect(Number.isNaN(h.horizonSlope[20 * 60 + 55])).toBe(true); // 450 m away
      expect(vis[20 * 60 + 55]).toBe(0);
    }
  });
});

describe("[TM1] reused buffers", () => {
  it("[TM1] a result computed into reused arrays equals a fresh one (no stale cells), with and without range", () => {
    const dem = syntheticDem({ width: 90, height: 70, cellSizeM: 10, seed: 9 });
    for (const mode of ["accurate", "fast"] as const) {
      for (const maxRangeM of [undefined, 350]) {
        const first = computeHorizon({ ...inputAt(dem.surface, 10, 10, 5, mode), maxRangeM });
        const second = { ...inputAt(dem.surface, 60, 50, 20, mode), maxRangeM };
        const reused = computeHorizon(second, first);
        const fresh = computeHorizon(second);
        expect(reused.horizonSlope).toBe(first.horizonSlope);
        expect(Array.from(reused.horizonSlope)).toEqual(Array.from(fresh.horizonSlope));
        expect(Array.from(reused.obstacleDistanceM)).toEqual(Array.from(fresh.obstacleDistanceM));
        expect(Array.from(reused.distanceM)).toEqual(Array.from(fresh.distanceM));
      }
    }
  });
});

describe("[TM8] degenerate grids and out-of-domain numbers", () => {
  it("[TM8] 1×1, 1×5, 5×1 and 2×2 grids give a horizon for every data cell from every observer position", () => {
    for (const [w, h] of [
      [1, 1],
      [1, 5],
      [5, 1],
      [2, 2],
    ]) {
      const g = grid(w, h, 10, (c, r) => 100 + ((c * 7 + r * 3) % 5));
      for (let c = 0; c < w; c++)
        for (let r = 0; r < h; r++)
          for (const mode of ["accurate", "fast"] as const) {
            const res = computeHorizon(inputAt(g, c, r, 3, mode));
            expect(res.horizonSlope.every((v) => !Number.isNaN(v))).toBe(true);
          }
    }
  });

  it("[TM8] a non-finite antenna height, k ≤ 0 or a non-positive range give an all-NaN horizon, no exception", () => {
    const g = grid(20, 20, 10, () => 100);
    for (const bad of [
      { antennaHeightAslM: Number.NaN },
      { effectiveEarthFactor: 0 },
      { effectiveEarthFactor: -1 },
      { maxRangeM: 0 },
      { ownFootprintRadiusM: -5 },
    ]) {
      for (const mode of ["accurate", "fast"] as const) {
        const res = computeHorizon({ ...inputAt(g, 5, 5, 10, mode), ...bad });
        expect(res.horizonSlope.every((v) => Number.isNaN(v))).toBe(true);
        expect(res.distanceM[5 * 20 + 6]).toBeCloseTo(10, 6);
      }
    }
  });
});

describe("[TM6] obstacle distance", () => {
  it("[TM6] the obstacle distance is NaN exactly where nothing obstructs and lies between observer and cell", () => {
    const dem = syntheticDem({ width: 120, height: 90, cellSizeM: 10, seed: 4 });
    for (let i = 0; i < 300; i++) dem.surface.data[(i * 7919) % (120 * 90)] = Number.NaN;
    for (const mode of ["accurate", "fast"] as const) {
      for (const ownFootprintRadiusM of [0, 35]) {
        const input = { ...inputAt(dem.surface, 40, 50, 8, mode), ownFootprintRadiusM };
        const h = computeHorizon(input);
        for (let i = 0; i < h.horizonSlope.length; i++) {
          const s = h.horizonSlope[i];
          const od = h.obstacleDistanceM[i];
          if (Number.isNaN(s) || s === Number.NEGATIVE_INFINITY) expect(Number.isNaN(od)).toBe(true);
          else {
            expect(od).toBeGreaterThan(ownFootprintRadiusM);
            expect(od).toBeLessThan(h.distanceM[i]);
          }
        }
      }
    }
  });
});
