import fc from "fast-check";
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

/** Plain flood fill (8-neighbour, explicit stack): the reference gapComponents is checked against. */
function floodFillComponents(gap: Uint8Array, width: number, height: number) {
  const seen = new Uint8Array(gap.length);
  let count = 0;
  let totalCells = 0;
  let largestCells = 0;
  let largestMeanCol = Number.NaN;
  let largestMeanRow = Number.NaN;
  for (let start = 0; start < gap.length; start++) {
    if (!gap[start] || seen[start]) continue;
    count++;
    const stack = [start];
    seen[start] = 1;
    let size = 0;
    let sumCol = 0;
    let sumRow = 0;
    while (stack.length > 0) {
      const i = stack.pop()!;
      const row = Math.floor(i / width);
      const col = i - row * width;
      size++;
      sumCol += col;
      sumRow += row;
      for (let dr = -1; dr <= 1; dr++)
        for (let dc = -1; dc <= 1; dc++) {
          const r = row + dr;
          const c = col + dc;
          if (r < 0 || r >= height || c < 0 || c >= width) continue;
          const j = r * width + c;
          if (gap[j] && !seen[j]) {
            seen[j] = 1;
            stack.push(j);
          }
        }
    }
    totalCells += size;
    if (size > largestCells) {
      largestCells = size;
      largestMeanCol = sumCol / size;
      largestMeanRow = sumRow / size;
    }
  }
  return { count, totalCells, largestCells, largestMeanCol, largestMeanRow };
}

describe("gap components", () => {
  it("[ME1] a narrow grid holds more runs than half its cells: a column of gap cells, one run a row", () => {
    // Found by the property below when no larger grid had run before in the thread.
    const gap = Uint8Array.from([1, 1, 0, 1, 1, 1, 0, 1, 1, 1, 1, 0, 1]);
    expect(gapComponents(gap, 1, 13)).toEqual(floodFillComponents(gap, 1, 13));
    expect(gapComponents(gap, 1, 13).count).toBe(4);
  });

  it("[ME1] equal a plain flood fill on random rasters (count, cells, largest and its mean cell, ties first)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: 0, max: 100 }),
        fc.integer(),
        (width, height, percent, seed) => {
          let x = seed | 1;
          const gap = new Uint8Array(width * height);
          for (let i = 0; i < gap.length; i++) {
            x ^= x << 13;
            x ^= x >>> 17;
            x ^= x << 5;
            gap[i] = (x >>> 0) / 2 ** 32 < percent / 100 ? 1 : 0;
          }
          expect(gapComponents(gap, width, height)).toEqual(floodFillComponents(gap, width, height));
        },
      ),
      { numRuns: 400 },
    );
  });
});
