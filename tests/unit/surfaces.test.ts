/** Obstruction surface: the burn rules of src/coverage/surfaces.ts on hand-checked geometries and properties. */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createGrid, type GridFrame } from "../../src/coverage/grid.ts";
import { burnObstructions, flatGround, rasteriseMax } from "../../src/coverage/surfaces.ts";

/** 10 × 10 cells of 1 m, western edge x = 0, northern edge y = 10: cell (c, r) centre (c + 0.5, 9.5 − r). */
const frame: GridFrame = {
  width: 10,
  height: 10,
  originX: 0,
  originY: 10,
  cellSizeM: 1,
  crs: "+proj=utm +zone=33 +datum=WGS84",
};

function rect(x0: number, y0: number, x1: number, y1: number): Float64Array {
  return Float64Array.from([x0, y0, x1, y0, x1, y1, x0, y1]);
}

function cellsOf(top: Float32Array): string[] {
  const rows: string[] = [];
  for (let r = 0; r < frame.height; r++) {
    let s = "";
    for (let c = 0; c < frame.width; c++) s += top[r * frame.width + c] > 0 ? "#" : ".";
    rows.push(s);
  }
  return rows;
}

describe("burnObstructions", () => {
  it("[SF3] a rectangle covers exactly the cells whose centres lie inside", () => {
    const top = new Float32Array(100);
    // x 2.2–5.7 holds centres 2.5, 3.5, 4.5, 5.5 (cols 2–5); y 6.1–8.9 holds 6.5, 7.5, 8.5 (rows 3–1).
    rasteriseMax(frame, [rect(2.2, 6.1, 5.7, 8.9)], 5, top);
    expect(cellsOf(top)).toEqual([
      "..........",
      "..####....",
      "..####....",
      "..####....",
      "..........",
      "..........",
      "..........",
      "..........",
      "..........",
      "..........",
    ]);
  });

  it("[SF4] a hole is left open, whatever the winding of the rings", () => {
    const outer = rect(1.1, 1.1, 8.9, 8.9);
    const hole = rect(3.1, 3.1, 6.9, 6.9);
    const reversed = Float64Array.from([3.1, 3.1, 3.1, 6.9, 6.9, 6.9, 6.9, 3.1]);
    for (const h of [hole, reversed]) {
      const top = new Float32Array(100);
      rasteriseMax(frame, [outer, h], 3, top);
      const rows = cellsOf(top);
      expect(rows[1]).toBe(".########.");
      expect(rows[4]).toBe(".##....##.");
      expect(rows[5]).toBe(".##....##.");
      expect(rows.join("").split("#").length - 1).toBe(64 - 16);
    }
  });

  it("[SF5] a centre on a shared edge is claimed by exactly one of the two footprints (half-open rule)", () => {
    const a = new Float32Array(100);
    const b = new Float32Array(100);
    // The shared edge x = 4.5 runs through the centres of column 4.
    rasteriseMax(frame, [rect(1.2, 1.2, 4.5, 8.8)], 1, a);
    rasteriseMax(frame, [rect(4.5, 1.2, 8.8, 8.8)], 1, b);
    for (let i = 0; i < 100; i++) expect(a[i] + b[i]).toBeLessThanOrEqual(1);
    const bothCover = cellsOf(a).map((row, r) =>
      [...row].map((ch, c) => (ch === "#" || cellsOf(b)[r][c] === "#" ? "#" : ".")).join(""),
    );
    expect(bothCover[4]).toBe(".########.");
  });

  it("[SF6] surface = ground + max(building, canopy); ground nodata stays nodata; the ground is not modified", () => {
    const ground = flatGround(frame, 100);
    ground.data[0] = Number.NaN;
    const before = ground.data.slice();
    const { surface, obstructionTopAglM } = burnObstructions(
      ground,
      [{ rings: [rect(0, 5, 5, 10)], heightM: 12, minHeightM: 0 }],
      [{ rings: [rect(3, 3, 8, 8)], canopyHeightM: 20 }],
    );
    expect(Number.isNaN(surface.data[0])).toBe(true);
    expect(obstructionTopAglM[0]).toBe(12);
    expect(surface.data[1]).toBe(112); // building only
    expect(obstructionTopAglM[2 * 10 + 4]).toBe(20); // building and trees overlap: canopy is taller
    expect(surface.data[2 * 10 + 4]).toBe(120);
    expect(surface.data[9 * 10 + 9]).toBe(100); // open ground
    expect(obstructionTopAglM[9 * 10 + 9]).toBe(0);
    expect(Array.from(ground.data)).toEqual(Array.from(before));
  });

  it("[SF7] a bridge (min_height > 0) burns its top as solid in the 2.5-D surface", () => {
    const ground = flatGround(frame, 0);
    const { surface } = burnObstructions(
      ground,
      [{ rings: [rect(0, 4, 10, 6)], heightM: 9, minHeightM: 6 }],
      [],
    );
    expect(surface.data[4 * 10 + 3]).toBe(9);
  });

  it("[SF8] NaN, zero, negative heights and degenerate rings burn nothing (the kernel is total)", () => {
    const ground = flatGround(frame, 50);
    const { surface } = burnObstructions(
      ground,
      [
        { rings: [rect(0, 0, 10, 10)], heightM: Number.NaN, minHeightM: 0 },
        { rings: [rect(0, 0, 10, 10)], heightM: -4, minHeightM: 0 },
        { rings: [Float64Array.from([1, 1, 2, 2])], heightM: 10, minHeightM: 0 },
        { rings: [Float64Array.from([1, 1, Number.NaN, 2, 3, 3])], heightM: 10, minHeightM: 0 },
        { rings: [], heightM: 10, minHeightM: 0 },
      ],
      [{ rings: [rect(0, 0, 10, 10)], canopyHeightM: 0 }],
    );
    expect(Array.from(surface.data).every((v) => v === 50)).toBe(true);
  });

  it("[SF9] footprints far outside the grid burn nothing and do not throw", () => {
    const top = new Float32Array(100);
    rasteriseMax(frame, [rect(1e6, 1e6, 1e6 + 5, 1e6 + 5)], 9, top);
    rasteriseMax(frame, [rect(-50, -50, 60, 60)], 2, top);
    expect(Array.from(top).every((v) => v === 2)).toBe(true);
  });

  it("[SF10] property: burned cells count ≈ polygon area / cell area, and adding a footprint never lowers the surface", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 6, noNaN: true }),
        fc.double({ min: 0, max: 6, noNaN: true }),
        fc.double({ min: 0.5, max: 4, noNaN: true }),
        fc.double({ min: 0.5, max: 4, noNaN: true }),
        fc.double({ min: 0.1, max: 60, noNaN: true }),
        (x, y, w, h, heightM) => {
          const ground = createGrid(frame, 10);
          const base = burnObstructions(
            ground,
            [{ rings: [rect(1, 1, 3, 3)], heightM: 5, minHeightM: 0 }],
            [],
          );
          const more = burnObstructions(
            ground,
            [
              { rings: [rect(1, 1, 3, 3)], heightM: 5, minHeightM: 0 },
              { rings: [rect(x, y, x + w, y + h)], heightM, minHeightM: 0 },
            ],
            [],
          );
          for (let i = 0; i < 100; i++)
            expect(more.surface.data[i]).toBeGreaterThanOrEqual(base.surface.data[i]);
          const alone = new Float32Array(100);
          rasteriseMax(frame, [rect(x, y, x + w, y + h)], 1, alone);
          const count = alone.reduce((a, b) => a + b, 0);
          // Cell-centre rule on an axis-aligned rectangle: per axis the count of centres in an
          // interval of length L is floor(L) or ceil(L).
          expect(count).toBeGreaterThanOrEqual(Math.floor(w) * Math.floor(h));
          expect(count).toBeLessThanOrEqual(Math.ceil(w) * Math.ceil(h));
        },
      ),
      { seed: 20261201, numRuns: 200 },
    );
  });
});
