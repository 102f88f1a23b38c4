import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { GridFrame } from "../../src/coverage/grid.ts";
import {
  approachRingMask,
  rasterisePolygons,
  squaredDistanceToMaskCells,
} from "../../src/coverage/regionMask.ts";

const frame: GridFrame = {
  width: 40,
  height: 30,
  originX: 0,
  originY: 300,
  cellSizeM: 10,
  crs: "+proj=utm +zone=33 +datum=WGS84",
};

describe("region masks", () => {
  it("[RG1] a square with a hole rasterises to cells whose centres are inside (even–odd)", () => {
    const outer = [
      [50, 250],
      [250, 250],
      [250, 50],
      [50, 50],
    ] as [number, number][];
    const hole = [
      [100, 200],
      [200, 200],
      [200, 100],
      [100, 100],
    ] as [number, number][];
    const mask = rasterisePolygons(frame, [[outer, hole]]);
    let count = 0;
    for (const v of mask) count += v;
    // Outer 200 m × 200 m = 20 × 20 cells, hole 10 × 10.
    expect(count).toBe(400 - 100);
    // Cell (col 15, row 15) has its centre (155, 145) in the hole.
    expect(mask[15 * 40 + 15]).toBe(0);
    expect(mask[6 * 40 + 6]).toBe(1);
  });

  it("[RG2] the exact distance transform equals brute force on random masks", () => {
    fc.assert(
      fc.property(fc.array(fc.boolean(), { minLength: 63, maxLength: 63 }), (bits) => {
        const w = 9;
        const h = 7;
        const mask = Uint8Array.from(bits, (b) => (b ? 1 : 0));
        const d2 = squaredDistanceToMaskCells(w, h, mask);
        for (let i = 0; i < w * h; i++) {
          let best = Number.POSITIVE_INFINITY;
          for (let j = 0; j < w * h; j++) {
            if (!mask[j]) continue;
            const dx = (i % w) - (j % w);
            const dy = Math.floor(i / w) - Math.floor(j / w);
            best = Math.min(best, dx * dx + dy * dy);
          }
          expect(d2[i]).toBe(best);
        }
      }),
    );
  });

  it("[RG3] the approach ring of a disc is an annulus of the ring depth (area within half a cell of π(R²−r²))", () => {
    const big: GridFrame = { ...frame, width: 200, height: 200, originY: 2000 };
    const circle: [number, number][] = [];
    for (let k = 0; k < 256; k++) {
      const a = (2 * Math.PI * k) / 256;
      circle.push([1000 + 300 * Math.cos(a), 1000 + 300 * Math.sin(a)]);
    }
    const prot = rasterisePolygons(big, [[circle]]);
    const ring = approachRingMask(big, prot, 200);
    let n = 0;
    for (let i = 0; i < ring.length; i++) {
      n += ring[i];
      expect(ring[i] & prot[i]).toBe(0);
    }
    const areaM2 = n * 100;
    const expected = Math.PI * (500 * 500 - 300 * 300);
    // Boundary error ≤ half a cell (5 m) on both circles: ±2π(500 + 300)·5 m².
    expect(Math.abs(areaM2 - expected)).toBeLessThan(2 * Math.PI * 800 * 5);
  });
});
