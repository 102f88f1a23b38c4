import { describe, expect, it } from "vitest";
import { CellState, fuseHeight } from "../../src/coverage/fusion.ts";
import { gapComponents, heightMetrics } from "../../src/coverage/metrics.ts";

describe("metrics", () => {
  it("[ME1] gap components are 8-connected; areas are cell counts times the cell area", () => {
    // 1 1 0 0
    // 0 0 1 0   <- diagonal neighbour joins the first component
    // 0 0 0 0
    // 1 0 0 1
    const gap = Uint8Array.from([1, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 0, 1, 0, 0, 1]);
    const c = gapComponents(gap, 4, 4);
    expect(c.count).toBe(3);
    expect(c.totalCells).toBe(5);
    expect(c.largestCells).toBe(3);
    expect(c.largestMeanCol).toBeCloseTo(1, 9);
    expect(c.largestMeanRow).toBeCloseTo(1 / 3, 9);
  });

  it("[ME2] fractions leave out cells inside obstructions; per-radar and only-this-radar areas add up", () => {
    // 2×3 grid, 10 m cells (100 m² each). Top row protected, bottom row ring.
    const width = 3;
    const height = 2;
    const regions = {
      protectedArea: Uint8Array.of(1, 1, 1, 0, 0, 0),
      approachRing: Uint8Array.of(0, 0, 0, 1, 1, 1),
    };
    const cellState = Uint8Array.of(0, 0, CellState.insideObstruction, 0, 0, 0);
    const pdA = Float32Array.of(0.95, 0.95, 0, 0.2, 0.95, 0);
    const pdB = Float32Array.of(0.0, 0.95, 0, 0.2, 0.0, 0);
    const requiredPd = 0.9;
    const fused = fuseHeight({ pdPerRadar: [pdA, pdB], requiredPd, cellState, regions });
    const m = heightMetrics({
      heightAglM: 30,
      fused,
      pdPerRadar: [pdA, pdB],
      radarIds: ["a", "b"],
      requiredPd,
      cellState,
      regions,
      width,
      height,
      originX: 1000,
      originY: 2000,
      cellSizeM: 10,
    });
    expect(m.protectedArea.cells).toBe(3);
    expect(m.protectedArea.validCells).toBe(2);
    expect(m.protectedArea.coveredFraction).toBe(1);
    expect(m.protectedArea.insideObstructionAreaM2).toBe(100);
    // Ring: cell 3 combined 1−0.8² = 0.36 (gap), cell 4 covered by a, cell 5 gap.
    expect(m.approachRing.coveredCells).toBe(1);
    expect(m.approachRing.coveredFraction).toBeCloseTo(1 / 3, 12);
    expect(m.gaps.count).toBe(2);
    expect(m.gaps.totalAreaM2).toBe(200);
    expect(m.overlapHistogram).toEqual([2, 2, 1]);
    expect(m.perRadar).toEqual([
      { radarId: "a", coveredAreaM2: 300, onlyThisRadarAreaM2: 200 },
      { radarId: "b", coveredAreaM2: 100, onlyThisRadarAreaM2: 0 },
    ]);
    // Largest gap is a single cell (tie: first found, cell 3 at col 0 row 1) → centre x 1005, y 1985.
    expect(m.gaps.largestCentroidXY).toEqual([1005, 1985]);
  });
});
