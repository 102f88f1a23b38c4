/**
 * The fast sweep (four quadrant lanes advanced together, row states in one work array, half rows in
 * segments) against the reference-plane recurrence it implements (Wang, Robinson & White 2000), written
 * here cell by cell with every test inline and the sight-line weights in their plain form. Any slip in
 * the lane bookkeeping — a row set of the wrong parity, a segment bound off by one, a lane reading its
 * neighbour's state, the longer half or the one-sided rows — shows up as a different horizon.
 * Rules TM1, TM2 and TM6 in docs/model-spec.md; agreement with GDAL is TM9 (tests/reference).
 */

import { describe, expect, it } from "vitest";
import { DEFAULT_EFFECTIVE_EARTH_FACTOR } from "../../src/coverage/constants.ts";
import type { Grid } from "../../src/coverage/grid.ts";
import { computeHorizonFast } from "../../src/coverage/maskFast.ts";
import { type SweepSetup, sweepSetup } from "../../src/coverage/terrainMask.ts";
import { prng } from "../fixtures/viewshed/syntheticDem.ts";

const CELL_M = 5;

/** Rough random terrain (no two cells alike, so no comparison in the sweep is a tie), some nodata. */
function terrain(width: number, height: number, seed: number, nodataEvery: number): Grid {
  const rnd = prng(seed);
  const data = new Float32Array(width * height);
  for (let i = 0; i < data.length; i++) data[i] = 100 + 40 * rnd() + 0.02 * (i % width);
  if (nodataEvery > 0) for (let i = 3; i < data.length; i += nodataEvery) data[i] = Number.NaN;
  return {
    data,
    width,
    height,
    originX: 0,
    originY: height * CELL_M,
    cellSizeM: CELL_M,
    crs: "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs",
  };
}

/**
 * The recurrence cell by cell: each cell's observable height is the larger of its own height relative to
 * the antenna (outside the footprint) and the sight line through the two neighbours nearer the observer,
 * interpolated where the line crosses the previous row (steep) or column (shallow); the obstacle distance
 * comes from the nearer of the two. Returns slope and obstacle distance as the sweep writes them (Float32),
 * NaN where the sweep writes nothing.
 */
function recurrence(s: SweepSetup): { slope: Float32Array; obstacleM: Float32Array } {
  const { width: w, height: h, observerCol: oc, observerRow: or, cellSizeM: cell } = s;
  const hState = new Float64Array(w * h);
  const oState = new Float64Array(w * h);
  const slope = new Float32Array(w * h).fill(Number.NaN);
  const obstacleM = new Float32Array(w * h).fill(Number.NaN);
  const rangeCells = s.maxRangeM / cell;
  const excl2 = (s.ownFootprintRadiusM / cell) ** 2;
  // Rows in order of |dy|, cells in order of |dx|: the neighbours nearer the observer are always done.
  const rows = [...Array(h).keys()].sort((a, b) => Math.abs(a - or) - Math.abs(b - or));
  for (const row of rows) {
    const ady = Math.abs(row - or);
    if (ady > rangeCells) continue;
    const halfSpan = Number.isFinite(rangeCells) ? Math.floor(Math.sqrt(rangeCells ** 2 - ady ** 2)) : w;
    const towardRow = row + Math.sign(or - row);
    const cols = [...Array(w).keys()]
      .filter((c) => Math.abs(c - oc) <= halfSpan)
      .sort((a, b) => Math.abs(a - oc) - Math.abs(b - oc));
    for (const col of cols) {
      const adx = Math.abs(col - oc);
      const towardCol = col + Math.sign(oc - col);
      const i = row * w + col;
      const dM = Math.sqrt(adx * adx + ady * ady) * cell;
      const rel = s.z[i] - (s.antennaHeightAslM + dM * dM * s.curvaturePerM);
      if (adx === 0 && ady === 0) {
        // The observer's own cell sees nothing and hides nothing (TM2).
        hState[i] = Number.NEGATIVE_INFINITY;
        oState[i] = Number.NaN;
        if (!Number.isNaN(s.z[i])) slope[i] = Number.NEGATIVE_INFINITY;
        continue;
      }
      const hOf = (r: number, c: number) => hState[r * w + c];
      const oOf = (r: number, c: number) => oState[r * w + c];
      const NEG = Number.NEGATIVE_INFINITY;
      let zp: number;
      let zo: number;
      if (adx === 0) {
        // Straight out along the observer's column; ring 1 sees past nothing.
        zp = ady <= 1 ? NEG : (hOf(towardRow, col) * ady) / (ady - 1);
        zo = ady <= 1 ? Number.NaN : oOf(towardRow, col);
      } else if (ady === 0) {
        zp = adx === 1 ? NEG : (hOf(row, towardCol) * adx) / (adx - 1);
        zo = oOf(row, towardCol);
      } else if (adx === ady) {
        zp = adx === 1 ? NEG : (hOf(towardRow, towardCol) * adx) / (adx - 1);
        zo = oOf(towardRow, towardCol);
      } else if (adx < ady) {
        // Crosses the previous row between the columns adx − 1 and adx.
        zp = (hOf(towardRow, towardCol) * adx + hOf(towardRow, col) * (ady - adx)) / (ady - 1);
        zo = 2 * adx < ady ? oOf(towardRow, col) : oOf(towardRow, towardCol);
      } else {
        // Crosses the previous column between the rows ady − 1 and ady.
        zp = (hOf(towardRow, towardCol) * ady + hOf(row, towardCol) * (adx - ady)) / (adx - 1);
        zo = 2 * ady < adx ? oOf(row, towardCol) : oOf(towardRow, towardCol);
      }
      if (!(zp > Number.NEGATIVE_INFINITY)) zo = Number.NaN;
      if (!Number.isNaN(s.z[i])) {
        slope[i] = zp / dM;
        obstacleM[i] = zo;
      }
      const raises = rel > zp && adx * adx + ady * ady > excl2;
      hState[i] = raises ? rel : zp;
      oState[i] = raises ? dM : zo;
    }
  }
  return { slope, obstacleM };
}

/** Cells where the two results differ beyond rounding (slope 1e-6 relative, distance 1 mm). */
function mismatches(a: Float32Array, b: Float32Array, relTol: number, absTol: number): number {
  let n = 0;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    const y = b[i];
    if (Number.isNaN(x) && Number.isNaN(y)) continue;
    if (x === y) continue;
    if (!(Math.abs(x - y) <= Math.max(absTol, relTol * Math.abs(x)))) n++;
  }
  return n;
}

describe("fast sweep: the lanes compute the reference-plane recurrence cell by cell", () => {
  const grids: [number, number, number][] = [
    [41, 37, 0],
    [23, 58, 0],
    [60, 19, 7],
    [1, 9, 0],
    [12, 1, 0],
  ];
  for (const [w, h, nodataEvery] of grids) {
    const g = terrain(w, h, w * 100 + h, nodataEvery);
    const cols = [...new Set([0, 1, 2, Math.floor(w / 2), Math.floor((2 * w) / 3), w - 2, w - 1])].filter(
      (c) => c >= 0 && c < w,
    );
    const rows = [...new Set([0, 1, 3, Math.floor(h / 2), h - 3, h - 1])].filter((r) => r >= 0 && r < h);
    const name = `${w}×${h} cells${nodataEvery ? `, nodata every ${nodataEvery}` : ""}`;
    it(`${name}: centre, edges and corners, with and without range limit and footprint`, () => {
      let cases = 0;
      for (const col of cols)
        for (const row of rows)
          for (const [maxRangeM, ownFootprintRadiusM, k] of [
            [undefined, 0, DEFAULT_EFFECTIVE_EARTH_FACTOR],
            [12 * CELL_M, 0, DEFAULT_EFFECTIVE_EARTH_FACTOR],
            [undefined, 3.2 * CELL_M, Number.POSITIVE_INFINITY],
          ] as [number | undefined, number, number][]) {
            const ground = g.data[row * w + col];
            const setup = sweepSetup(
              {
                surface: g,
                observerX: (col + 0.5) * CELL_M,
                observerY: g.originY - (row + 0.5) * CELL_M,
                antennaHeightAslM: (Number.isNaN(ground) ? 120 : ground) + 12,
                effectiveEarthFactor: k,
                maxRangeM,
                ownFootprintRadiusM,
                mode: "fast",
              },
              col,
              row,
            );
            if (setup === null) throw new Error("setup refused");
            const slope = new Float32Array(w * h).fill(Number.NaN);
            const obstacleM = new Float32Array(w * h).fill(Number.NaN);
            computeHorizonFast(setup, slope, obstacleM);
            const ref = recurrence(setup);
            const where = `observer (${col}, ${row}), range ${maxRangeM}, footprint ${ownFootprintRadiusM}`;
            expect(mismatches(slope, ref.slope, 1e-6, 1e-9), where).toBe(0);
            expect(mismatches(obstacleM, ref.obstacleM, 0, 1e-3), where).toBe(0);
            cases++;
          }
      expect(cases).toBe(cols.length * rows.length * 3);
    });
  }
});
