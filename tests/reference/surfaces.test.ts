/**
 * Footprint rasterisation against GDAL 3.6.2 gdal.RasterizeLayer (cell-centre rule) on the
 * committed masks of tests/fixtures/surfaces (generator: make_fixtures.py): a concave building,
 * a courtyard (hole), a two-part multipolygon, a thin diagonal sliver, a footprint partly outside
 * the grid and a star-shaped tree stand overlapping a building.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import type { GridFrame } from "../../src/coverage/grid.ts";
import { burnObstructions, flatGround, rasteriseMax } from "../../src/coverage/surfaces.ts";

interface Shape {
  kind: "building" | "trees";
  heightM: number;
  polygons: number[][][][];
  gdalMask: string[];
}
const fixture = JSON.parse(
  readFileSync(fileURLToPath(new URL("../fixtures/surfaces/footprints.json", import.meta.url)), "utf8"),
) as { gdalVersion: string; frame: GridFrame; shapes: Shape[] };
const { frame, shapes } = fixture;

function ringsOf(s: Shape): Float64Array[] {
  return s.polygons.flatMap((poly) => poly.map((ring) => Float64Array.from(ring.flat())));
}

describe(`footprint rasterisation against GDAL ${fixture.gdalVersion} RasterizeLayer`, () => {
  for (const [k, s] of shapes.entries()) {
    it(`[SF1] shape ${k} (${s.kind}, ${s.polygons.length} part(s), ${s.polygons[0].length} ring(s)) covers exactly GDAL's cells`, () => {
      const top = new Float32Array(frame.width * frame.height);
      rasteriseMax(frame, ringsOf(s), 1, top);
      let mismatches = 0;
      let inside = 0;
      for (let r = 0; r < frame.height; r++) {
        for (let c = 0; c < frame.width; c++) {
          const gdal = s.gdalMask[r][c] === "1";
          if (gdal) inside++;
          if (gdal !== (top[r * frame.width + c] === 1)) mismatches++;
        }
      }
      expect(inside).toBeGreaterThan(0);
      expect(mismatches).toBe(0);
    });
  }

  it("[SF2] the burned surface is ground + the tallest footprint at each cell (GDAL masks, max of heights)", () => {
    const ground = flatGround(frame, 250);
    const buildings = shapes
      .filter((s) => s.kind === "building")
      .map((s) => ({ rings: ringsOf(s), heightM: s.heightM, minHeightM: 0 }));
    const trees = shapes
      .filter((s) => s.kind === "trees")
      .map((s) => ({ rings: ringsOf(s), canopyHeightM: s.heightM }));
    const { surface, obstructionTopAglM } = burnObstructions(ground, buildings, trees);
    for (let r = 0; r < frame.height; r++) {
      for (let c = 0; c < frame.width; c++) {
        let expected = 0;
        for (const s of shapes) if (s.gdalMask[r][c] === "1") expected = Math.max(expected, s.heightM);
        const i = r * frame.width + c;
        expect(obstructionTopAglM[i]).toBeCloseTo(expected, 4);
        expect(surface.data[i]).toBeCloseTo(250 + expected, 3);
      }
    }
  });
});
