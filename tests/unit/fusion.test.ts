import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CellState, cellStatesAtHeight, fuseHeight, NO_RADAR } from "../../src/coverage/fusion.ts";

const regionsAll = (n: number) => ({
  protectedArea: new Uint8Array(n).fill(1),
  approachRing: new Uint8Array(n),
});

describe("fusion", () => {
  it("[FU1] combined Pd = 1 − Π(1 − Pd_i) (independent OR rule, worked by hand)", () => {
    // 1 − (1 − 0.5)(1 − 0.8) = 0.9; 1 − 0.9·0.7 = 0.37.
    const fused = fuseHeight({
      pdPerRadar: [Float32Array.of(0.5, 0.1), Float32Array.of(0.8, 0.3)],
      requiredPd: 0.7,
      cellState: new Uint8Array(2),
      regions: regionsAll(2),
    });
    expect(fused.combinedPd[0]).toBeCloseTo(0.9, 6);
    expect(fused.combinedPd[1]).toBeCloseTo(0.37, 6);
    expect(Array.from(fused.overlapCount)).toEqual([1, 0]);
    expect(Array.from(fused.bestRadar)).toEqual([1, 1]);
    expect(Array.from(fused.gap)).toEqual([0, 1]);
  });

  it("[FU2] combined Pd is at least the best single Pd and at most 1; overlap counts radars meeting the requirement", () => {
    fc.assert(
      fc.property(
        fc.array(fc.float({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 8 }),
        fc.float({ min: Math.fround(0.05), max: Math.fround(0.99), noNaN: true }),
        (pds, req) => {
          const fused = fuseHeight({
            pdPerRadar: pds.map((p) => Float32Array.of(p)),
            requiredPd: req,
            cellState: new Uint8Array(1),
            regions: regionsAll(1),
          });
          const best = Math.max(...pds.map((p) => Math.fround(p)));
          expect(fused.combinedPd[0]).toBeGreaterThanOrEqual(best - 1e-6);
          expect(fused.combinedPd[0]).toBeLessThanOrEqual(1);
          expect(fused.overlapCount[0]).toBe(pds.filter((p) => Math.fround(p) >= req).length);
        },
      ),
    );
  });

  it("[FU3] cells inside an obstruction or without data are never gaps and carry no Pd", () => {
    const fused = fuseHeight({
      pdPerRadar: [Float32Array.of(0.1, 0.1, 0.1)],
      requiredPd: 0.9,
      cellState: Uint8Array.of(CellState.valid, CellState.insideObstruction, CellState.nodata),
      regions: regionsAll(3),
    });
    expect(Array.from(fused.gap)).toEqual([1, 0, 0]);
    expect(fused.combinedPd[1]).toBe(0);
    expect(fused.bestRadar[2]).toBe(NO_RADAR);
  });

  it("[FU4] gaps are marked only inside the protected area or approach ring", () => {
    const fused = fuseHeight({
      pdPerRadar: [new Float32Array(3)],
      requiredPd: 0.5,
      cellState: new Uint8Array(3),
      regions: { protectedArea: Uint8Array.of(1, 0, 0), approachRing: Uint8Array.of(0, 1, 0) },
    });
    expect(Array.from(fused.gap)).toEqual([1, 1, 0]);
  });

  it("[FU5] a target below the roof top is inside the obstruction; at or above it is valid", () => {
    const states = cellStatesAtHeight(Float32Array.of(100, 100, Number.NaN), Float32Array.of(12, 10, 0), 10);
    expect(Array.from(states)).toEqual([CellState.insideObstruction, CellState.valid, CellState.nodata]);
  });
});
