/**
 * The synthetic site of the coverage benchmarks (rough terrain with buildings, a circular protected
 * area and approach ring) and the kernel timings made on it. Free of Node modules, so that
 * browserKernels.bench.ts runs the very same code in Chromium as in Node.
 */
import { type PlacedRadar, radarCoverageFromHorizon } from "../../src/coverage/coverage.ts";
import type { PreparedSite } from "../../src/coverage/evaluate.ts";
import type { RadarModel } from "../../src/coverage/radarModel.ts";
import { computeHorizon, type MaskMode } from "../../src/coverage/terrainMask.ts";
import { syntheticDem } from "../fixtures/viewshed/syntheticDem.ts";
import { cellXY, placed, stageOf } from "../unit/coverageFixtures.ts";

export const SIDE = 2048;

export function siteOn(
  cellSizeM: number,
  radars: (n: { frame: PreparedSite["frame"]; ground: Float32Array }) => PlacedRadar[],
  heights: number[],
  side = SIDE,
): PreparedSite {
  const dem = syntheticDem({ width: side, height: side, cellSizeM, seed: 7, buildings: 400 });
  const frame = {
    width: side,
    height: side,
    originX: 500_000,
    originY: 4_600_000,
    cellSizeM,
    crs: "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs",
  };
  const n = side * side;
  const ground = dem.ground.data;
  const surface = dem.surface.data;
  const top = new Float32Array(n);
  for (let i = 0; i < n; i++) top[i] = surface[i] - ground[i];
  const protectedArea = new Uint8Array(n);
  const approachRing = new Uint8Array(n);
  for (let r = 0; r < side; r++)
    for (let c = 0; c < side; c++) {
      const d = Math.hypot(r - side / 2, c - side / 2);
      if (d < side / 6) protectedArea[r * side + c] = 1;
      else if (d < side / 3) approachRing[r * side + c] = 1;
    }
  return {
    name: "bench",
    frame,
    ground,
    surface,
    obstructionTopAglM: top,
    regions: { protectedArea, approachRing },
    radars: radars({ frame, ground }),
    targets: [{ id: "quad", name: "quad", rcsDbsm: -20, swerling: 1, heightsAglM: heights }],
    requirement: { requiredPd: 0.8, pfa: 1e-6, looks: 1, targetIds: ["quad"] },
    heightsAglM: heights,
    effectiveEarthFactor: 4 / 3,
    maskMode: "accurate",
    groundSource: "dem",
    warnings: [],
  };
}

export function radarAt(
  s: { frame: PreparedSite["frame"]; ground: Float32Array },
  model: RadarModel,
  col: number,
  row: number,
  boresightAzDeg: number,
  id: string,
): PlacedRadar {
  const f = s.frame;
  return placed(model, cellXY(f, col, row), s.ground[row * f.width + col] + 20, {
    id,
    name: id,
    boresightAzDeg,
  });
}

/**
 * Radar stage alone (SNR, Pd and reason for 4 heights, one class, horizon given) of one radar at the
 * centre of a side × side site: ns per cell with new outputs and with the previous outputs reused,
 * interleaved run by run after one warm-up run (JIT).
 */
export function stageTimes(
  model: RadarModel,
  cellSizeM: number,
  runs: number,
  side = SIDE,
): { fresh: number[]; reused: number[]; cells: number } {
  const heights = [10, 30, 60, 100];
  const site = siteOn(cellSizeM, (s) => [radarAt(s, model, side / 2, side / 2, 45, "r")], heights, side);
  const radar = site.radars[0];
  const { kernel, horizon } = stageOf(site, radar);
  const input = { ...site, radar, effectiveEarthFactor: 4 / 3 };
  const n = side * side;
  const previous = radarCoverageFromHorizon(input, kernel, horizon);
  const fresh: number[] = [];
  const reused: number[] = [];
  for (let r = 0; r < runs; r++) {
    let t = performance.now();
    radarCoverageFromHorizon(input, kernel, horizon);
    fresh.push(((performance.now() - t) * 1e6) / n);
    t = performance.now();
    radarCoverageFromHorizon(input, kernel, horizon, previous);
    reused.push(((performance.now() - t) * 1e6) / n);
  }
  return { fresh, reused, cells: n };
}

/**
 * One masking sweep (computeHorizon, no range limit) from a post near the centre of a side × side
 * site of 10 m cells, 15 m above ground: ns per cell, the previous result reused, after one warm-up run.
 */
export function sweepTimes(mode: MaskMode, runs: number, side = SIDE): number[] {
  const site = siteOn(10, () => [], [10], side);
  const f = site.frame;
  const col = Math.floor(0.45 * side);
  const row = Math.floor(0.55 * side);
  const [x, y] = cellXY(f, col, row);
  const input = {
    surface: { ...f, data: site.surface },
    observerX: x,
    observerY: y,
    antennaHeightAslM: site.ground[row * side + col] + 15,
    effectiveEarthFactor: 4 / 3,
    mode,
  };
  const previous = computeHorizon(input);
  const times: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t = performance.now();
    computeHorizon(input, previous);
    times.push(((performance.now() - t) * 1e6) / (side * side));
  }
  return times;
}
