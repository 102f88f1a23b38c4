/** A site frame on the DEM's own lattice is copied pixel for pixel (src/io/demResample.ts). */
import { describe, expect, it } from "vitest";
import { resampleToFrame, type SourceRaster } from "../../src/io/demResample.ts";

const CRS = "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs";

function source(): SourceRaster {
  const width = 6;
  const height = 5;
  const data = new Float32Array(width * height).map((_, i) => 100 + i);
  data[2 * width + 3] = Number.NaN;
  return { data, width, height, originX: 1000, originY: 5000, pixelSizeX: 10, pixelSizeY: 10, crs: CRS };
}

describe("resampling onto the source's own lattice", () => {
  it("the whole grid comes back unchanged, cells beside nodata included", () => {
    const s = source();
    const { grid, coveredFraction } = resampleToFrame(s, {
      width: 6,
      height: 5,
      originX: 1000,
      originY: 5000,
      cellSizeM: 10,
      crs: CRS,
    });
    expect(Array.from(grid.data)).toEqual(Array.from(s.data));
    expect(coveredFraction).toBeCloseTo(29 / 30, 12);
  });

  it("a frame shifted by whole pixels takes the overlapping pixels and NaN beyond the source", () => {
    const s = source();
    const { grid, coveredFraction } = resampleToFrame(s, {
      width: 3,
      height: 2,
      originX: 1040, // column 4
      originY: 4990, // row 1
      cellSizeM: 10,
      crs: CRS,
    });
    expect(Array.from(grid.data)).toEqual([110, 111, Number.NaN, 116, 117, Number.NaN]);
    expect(coveredFraction).toBeCloseTo(4 / 6, 12);
  });

  it("a half-pixel shift is interpolated, not copied", () => {
    const s = source();
    const { grid } = resampleToFrame(s, {
      width: 1,
      height: 1,
      originX: 1005,
      originY: 5000,
      cellSizeM: 10,
      crs: CRS,
    });
    expect(grid.data[0]).toBeCloseTo(100.5, 5);
  });
});
