/**
 * DEM readers: georeferencing rules and hostile inputs. Small GeoTIFFs are written here with
 * geotiff's writeArrayBuffer (and patched by hand for hostile headers); the agreement with GDAL
 * is checked in tests/reference/demResample.test.ts.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { writeArrayBuffer } from "geotiff";
import proj4 from "proj4";
import { describe, expect, it } from "vitest";
import {
  FOOT_M,
  MAX_DEM_HEADER_SIDE_CELLS,
  MAX_DEM_WINDOW_CELLS,
  MAX_ELEVATION_M,
  MIN_ELEVATION_M,
} from "../../src/coverage/constants.ts";
import type { GridFrame } from "../../src/coverage/grid.ts";
import { flatGround } from "../../src/coverage/surfaces.ts";
import { readAscDem } from "../../src/io/demAsc.ts";
import { crsFromEpsg, readGeoTiffDem } from "../../src/io/demGeotiff.ts";
import { hgtTileOrigin, readHgtDem } from "../../src/io/demHgt.ts";
import { resampleToFrame } from "../../src/io/demResample.ts";
import { ImportError, isImportError } from "../../src/io/importErrors.ts";
import { patchTiffEntry } from "../fixtures/dem/tiffPatch.ts";

// TIFF 6.0 and GeoTIFF 1.1 tag numbers.
const TAG_STRIP_OFFSETS = 273;
const TAG_ROWS_PER_STRIP = 278;
const TAG_GEO_ASCII_PARAMS = 34_737;

const UTM33 = "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs";

/** A 10 × 8 site grid of 10 m cells at (500 000, 5 200 000) in UTM 33N. */
const frame: GridFrame = {
  width: 10,
  height: 8,
  originX: 500_000,
  originY: 5_200_000,
  cellSizeM: 10,
  crs: UTM33,
};

interface TiffSpec {
  width: number;
  height: number;
  values: (col: number, row: number) => number;
  pixelM: number;
  originX: number;
  originY: number;
  keys?: Record<string, number | number[]>;
  nodata?: string;
}

/** A Float32 GeoTIFF (big-endian, one strip) written with geotiff's writer. */
function makeTiff(spec: TiffSpec): ArrayBuffer {
  const v = new Float32Array(spec.width * spec.height);
  for (let r = 0; r < spec.height; r++)
    for (let c = 0; c < spec.width; c++) v[r * spec.width + c] = spec.values(c, r);
  const meta: Record<string, unknown> = {
    width: spec.width,
    height: spec.height,
    SampleFormat: [3],
    BitsPerSample: [32],
    ModelPixelScale: [spec.pixelM, spec.pixelM, 0],
    ModelTiepoint: [0, 0, 0, spec.originX, spec.originY, 0],
    ...(spec.keys ?? { GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32633 }),
  };
  if (spec.nodata !== undefined) meta.GDAL_NODATA = spec.nodata;
  return writeArrayBuffer(v, meta);
}

/** A DEM of 5 m pixels over the site and beyond: elevation = 100 + x/10 − y/20 in grid metres. */
const planeSpec: TiffSpec = {
  width: 40,
  height: 30,
  pixelM: 5,
  originX: 499_950,
  originY: 5_200_050,
  values: (c, r) =>
    100 + (499_950 + (c + 0.5) * 5 - 500_000) / 10 - (5_200_050 - (r + 0.5) * 5 - 5_200_000) / 20,
};

/** Rewrite ImageWidth (256) and ImageLength (257) in the first IFD of a big-endian TIFF. */
function patchSize(buffer: ArrayBuffer, width: number, height: number): ArrayBuffer {
  const out = buffer.slice(0);
  const dv = new DataView(out);
  const ifd = dv.getUint32(4, false);
  const n = dv.getUint16(ifd, false);
  for (let i = 0; i < n; i++) {
    const e = ifd + 2 + i * 12;
    const tag = dv.getUint16(e, false);
    if (tag === 256 || tag === 257) {
      dv.setUint16(e + 2, 4, false); // LONG
      dv.setUint32(e + 4, 1, false);
      dv.setUint32(e + 8, tag === 256 ? width : height, false);
    }
  }
  return out;
}

async function importError(p: Promise<unknown> | (() => unknown)): Promise<ImportError> {
  try {
    if (typeof p === "function") p();
    else await p;
  } catch (e) {
    expect(e).toBeInstanceOf(ImportError);
    expect((e as Error).name).toBe("ImportError");
    expect(isImportError(e)).toBe(true);
    return e as ImportError;
  }
  throw new Error("expected an ImportError");
}

describe("GeoTIFF DEM", () => {
  it("[DM5] a metric DEM in the grid's CRS is sampled bilinearly at cell centres (a plane is exact)", async () => {
    const r = await readGeoTiffDem(makeTiff(planeSpec), frame, { fileName: "plane.tif" });
    for (let row = 0; row < frame.height; row++) {
      for (let col = 0; col < frame.width; col++) {
        const x = (col + 0.5) * 10;
        const y = -(row + 0.5) * 10;
        // Bilinear interpolation reproduces a plane exactly; Float32 storage bounds the error.
        expect(r.ground.data[row * frame.width + col]).toBeCloseTo(100 + x / 10 - y / 20, 3);
      }
    }
    expect(r.warnings).toEqual([]);
    expect(r.source).toEqual({ kind: "geotiff", crs: crsFromEpsg(32633), surfaceKind: "unknown" });
  });

  it("[DM6] GDAL_NODATA becomes NaN and nodata never gets a value from its neighbours", async () => {
    const spec = {
      ...planeSpec,
      nodata: "-9999",
      values: (c: number, r: number) => (c === 20 && r === 15 ? -9999 : 50),
    };
    const r = await readGeoTiffDem(makeTiff(spec), frame, { fileName: "hole.tif" });
    // Pixel (20, 15) has its centre at (500 052.5, 5 199 972.5): cells around it are NaN.
    const col = Math.floor(52.5 / 10);
    const row = Math.floor(27.5 / 10);
    expect(Number.isNaN(r.ground.data[row * frame.width + col])).toBe(true);
    expect(r.ground.data[0]).toBe(50);
    expect(r.warnings.some((w) => /covers .* % of the site grid/.test(w))).toBe(true);
  });

  it("[DM5] a ModelTransformation matrix georeferences like tie point + pixel scale; a rotated one is refused", async () => {
    const base = makeTiff(planeSpec);
    const v = new Float32Array(planeSpec.width * planeSpec.height);
    for (let r = 0; r < planeSpec.height; r++)
      for (let c = 0; c < planeSpec.width; c++) v[r * planeSpec.width + c] = planeSpec.values(c, r);
    const matrix = (b: number) => [
      5,
      b,
      0,
      planeSpec.originX,
      0,
      -5,
      0,
      planeSpec.originY,
      0,
      0,
      0,
      0,
      0,
      0,
      0,
      1,
    ];
    const meta = (b: number) => ({
      width: planeSpec.width,
      height: planeSpec.height,
      SampleFormat: [3],
      BitsPerSample: [32],
      ModelTransformation: matrix(b),
      GTModelTypeGeoKey: 1,
      GTRasterTypeGeoKey: 1,
      ProjectedCSTypeGeoKey: 32633,
    });
    const a = await readGeoTiffDem(writeArrayBuffer(v, meta(0)), frame);
    const b = await readGeoTiffDem(base, frame);
    expect(Array.from(a.ground.data)).toEqual(Array.from(b.ground.data));
    const e = await importError(
      readGeoTiffDem(writeArrayBuffer(v, meta(0.5)), frame, { fileName: "rot.tif" }),
    );
    expect(e.field).toBe("ModelTransformation");
  });

  it("[DM7] PixelIsPoint tie points name a pixel centre (shifted half a pixel, as GDAL reads them)", async () => {
    const asPoint = makeTiff({
      ...planeSpec,
      originX: planeSpec.originX + 2.5,
      originY: planeSpec.originY - 2.5,
      keys: { GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 2, ProjectedCSTypeGeoKey: 32633 },
    });
    const a = await readGeoTiffDem(asPoint, frame);
    const b = await readGeoTiffDem(makeTiff(planeSpec), frame);
    for (let i = 0; i < a.ground.data.length; i++) expect(a.ground.data[i]).toBeCloseTo(b.ground.data[i], 4);
  });

  it("[DM8] elevations in feet (VerticalUnitsGeoKey 9002) are converted to metres", async () => {
    const spec = {
      ...planeSpec,
      values: () => 100,
      keys: {
        GTModelTypeGeoKey: 1,
        GTRasterTypeGeoKey: 1,
        ProjectedCSTypeGeoKey: 32633,
        VerticalUnitsGeoKey: 9002,
      },
    };
    const r = await readGeoTiffDem(makeTiff(spec), frame);
    expect(r.ground.data[0]).toBeCloseTo(100 * FOOT_M, 4);
  });

  it("[DM9] a truncated TIFF is refused with a message naming the file", async () => {
    const full = makeTiff(planeSpec);
    const cut = full.slice(0, Math.floor(full.byteLength * 0.6));
    const e = await importError(readGeoTiffDem(cut, frame, { fileName: "cut.tif" }));
    expect(e.message).toMatch(/^cut\.tif: /);
    expect(e.message).toMatch(/truncated|damaged|not a readable TIFF/);
    const stub = full.slice(0, 20);
    const e2 = await importError(readGeoTiffDem(stub, frame, { fileName: "stub.tif" }));
    expect(e2.message).toMatch(/^stub\.tif: /);
    const notTiff = new TextEncoder().encode("this is not a TIFF at all").buffer as ArrayBuffer;
    expect((await importError(readGeoTiffDem(notTiff, frame, { fileName: "x.tif" }))).message).toMatch(
      /not a readable TIFF/,
    );
  });

  it("[DM9] an image-directory chain that loops back is refused at once, not followed forever", async () => {
    const buf = makeTiff(planeSpec).slice(0);
    const dv = new DataView(buf);
    const ifd = dv.getUint32(4, false);
    const entries = dv.getUint16(ifd, false);
    dv.setUint32(ifd + 2 + entries * 12, ifd, false); // next IFD = itself
    const e = await importError(readGeoTiffDem(buf, frame, { fileName: "loop.tif" }));
    expect(e.message).toBe("loop.tif: damaged TIFF: the chain of image directories loops back on itself");
  });

  it("[DM10] a 200 000 × 200 000 header is refused by size before anything is allocated", async () => {
    const huge = patchSize(makeTiff(planeSpec), 200_000, 200_000);
    const e = await importError(readGeoTiffDem(huge, frame, { fileName: "huge.tif" }));
    expect(e.field).toBe("ImageWidth");
    expect(e.message).toContain("200000 × 200000");
    expect(e.message).toContain(String(MAX_DEM_HEADER_SIDE_CELLS));
  });

  it("[DM11] a window above the cap is refused (a very fine DEM over a large site)", async () => {
    // 2^17 × 2^17 header of 1 mm pixels: within the side cap, but the site window would be 10^10 pixels.
    const fine = patchSize(
      makeTiff({ ...planeSpec, pixelM: 0.001, originX: 500_000, originY: 5_200_000 }),
      131_072,
      131_072,
    );
    const big: GridFrame = { ...frame, width: 1000, height: 1000, cellSizeM: 100 };
    const e = await importError(readGeoTiffDem(fine, big, { fileName: "fine.tif" }));
    expect(e.message).toContain(String(MAX_DEM_WINDOW_CELLS));
  });

  it("[DM11] a single strip or tile above the window cap is refused before it is decoded", async () => {
    // A 100 000 × 100 000 header (within the side cap) whose RowsPerStrip (tag 278) claims one strip of
    // all 10^10 pixels: a tiny site window still needs that whole strip decoded.
    const buf = patchSize(makeTiff(planeSpec), 100_000, 100_000);
    const dv = new DataView(buf);
    const ifd = dv.getUint32(4, false);
    const n = dv.getUint16(ifd, false);
    for (let i = 0; i < n; i++) {
      const e = ifd + 2 + i * 12;
      if (dv.getUint16(e, false) === 278) {
        dv.setUint16(e + 2, 4, false);
        dv.setUint32(e + 8, 100_000, false);
      }
    }
    const site: GridFrame = { ...frame, width: 2, height: 2, cellSizeM: 1 };
    const e = await importError(readGeoTiffDem(buf, site, { fileName: "strip.tif" }));
    expect(e.message).toMatch(
      /^strip\.tif: RowsPerStrip: one strip or tile of 100000 × 100000 pixels is above the 33554432/,
    );
    expect(e.field).toBe("RowsPerStrip");
  });

  it("[DM25] GeoKeys pointing at a params tag the file lacks are refused, naming the GeoKeyDirectory", async () => {
    const keys = { GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32633 };
    const withCitation = makeTiff({
      ...planeSpec,
      keys: { ...keys, GTCitationGeoKey: "test grid" } as never,
    });
    expect((await readGeoTiffDem(withCitation, frame)).ground.width).toBe(10);
    const lost = patchTiffEntry(withCitation, TAG_GEO_ASCII_PARAMS, { tag: 65_003 });
    const e = await importError(readGeoTiffDem(lost, frame, { fileName: "keys.tif" }));
    expect(e.field).toBe("GeoKeyDirectory");
    expect(e.message).toMatch(/^keys\.tif: GeoKeyDirectory: damaged GeoKeys \(.+\)$/);
  });

  it("[DM26] a strip offsets array stored past the end of the file is refused, naming the tag", async () => {
    const tif = makeTiff(planeSpec);
    const bad = patchTiffEntry(tif, TAG_STRIP_OFFSETS, { count: 600, value: 0x7fff_ffff });
    const e = await importError(readGeoTiffDem(bad, frame, { fileName: "offsets.tif" }));
    expect(e.field).toBe("StripOffsets");
    expect(e.message).toMatch(/the file is truncated or damaged: this tag's values cannot be read/);
  });

  it("[DM27] fewer strips listed than the rows need is refused (the rest would read as 0 m)", async () => {
    // planeSpec is one strip of 30 rows; RowsPerStrip 1 then needs 30 strips.
    const bad = patchTiffEntry(makeTiff(planeSpec), TAG_ROWS_PER_STRIP, { value: 1 });
    const e = await importError(readGeoTiffDem(bad, frame, { fileName: "rows.tif" }));
    expect(e.message).toBe(
      "rows.tif: StripOffsets: damaged TIFF: the image needs 30 blocks (30 strips of 1 row (RowsPerStrip 1)) but 1 are listed",
    );
  });

  it("[DM28] samples beyond Earth's elevations (±∞, 3e38) are nodata with a warning; none plausible is refused", async () => {
    // Columns west of x = 500 010 m are +∞: the site's first cell is nodata, its last one is not.
    const someBad = makeTiff({
      ...planeSpec,
      values: (c, r) => (c < 12 ? Number.POSITIVE_INFINITY : 100 + r),
    });
    const dem = await readGeoTiffDem(someBad, frame, { fileName: "inf.tif" });
    expect(dem.warnings.join("\n")).toMatch(
      new RegExp(
        `inf\\.tif: [1-9]\\d* samples outside ${MIN_ELEVATION_M} to ${MAX_ELEVATION_M} m \\(e\\.g\\. Infinity m\\) are read as nodata\\.`,
      ),
    );
    expect(Number.isNaN(dem.ground.data[0])).toBe(true);
    expect(dem.ground.data[frame.width - 1]).toBeGreaterThan(100);
    const allBad = makeTiff({ ...planeSpec, values: () => 3e38 });
    const e = await importError(readGeoTiffDem(allBad, frame, { fileName: "huge.tif" }));
    expect(e.message).toBe(
      `huge.tif: no sample is an elevation on Earth (${MIN_ELEVATION_M} to ${MAX_ELEVATION_M} m; e.g. 3.0e+38 m): check the sample format and the vertical unit`,
    );
  });

  it("[DM12] an EPSG code that is not built in is refused, naming the code and the key", async () => {
    const spec = {
      ...planeSpec,
      keys: { GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, ProjectedCSTypeGeoKey: 31468 },
    };
    const e = await importError(readGeoTiffDem(makeTiff(spec), frame, { fileName: "gk4.tif" }));
    expect(e.field).toBe("ProjectedCSTypeGeoKey");
    expect(e.message).toContain("EPSG:31468");
    const user = {
      ...planeSpec,
      keys: { GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32767 },
    };
    expect((await importError(readGeoTiffDem(makeTiff(user), frame))).message).toContain("user-defined");
    // A hand-made key directory (GeoTIFF 1.1 §7.1): version 1.1.0, one key, GTModelTypeGeoKey (1024) = 3,
    // geocentric, which is no raster CRS.
    const none = { ...planeSpec, keys: { GeoKeyDirectory: [1, 1, 0, 1, 1024, 0, 1, 3] } };
    expect((await importError(readGeoTiffDem(makeTiff(none), frame))).field).toBe("GTModelTypeGeoKey");
  });

  it("[DM13] a DEM in the wrong CRS (elsewhere on Earth) is refused as not overlapping", async () => {
    // Same numbers, but declared UTM 32N: 500 km west of the site in UTM 33N.
    const spec = {
      ...planeSpec,
      keys: { GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, ProjectedCSTypeGeoKey: 32632 },
    };
    const e = await importError(readGeoTiffDem(makeTiff(spec), frame, { fileName: "zone32.tif" }));
    expect(e.message).toMatch(/does not overlap the site grid/);
  });

  it("[DM14] a geographic DEM (EPSG:4326) is reprojected, never used in degrees", async () => {
    // 0.001° pixels around the site's position (15° E, about 46.95° N).
    const step = 0.001;
    const spec: TiffSpec = {
      width: 20,
      height: 20,
      pixelM: step,
      originX: 14.995,
      originY: 46.96,
      values: () => 321,
      keys: { GTModelTypeGeoKey: 2, GTRasterTypeGeoKey: 1, GeographicTypeGeoKey: 4326 },
    };
    const r = await readGeoTiffDem(makeTiff(spec), frame, { fileName: "geo.tif" });
    expect(r.ground.cellSizeM).toBe(10);
    expect(r.ground.crs).toBe(UTM33);
    expect(Array.from(r.ground.data).every((v) => v === 321)).toBe(true);
    expect(r.warnings.join(" ")).toMatch(/reprojected/);
  });
});

describe("SRTM .hgt", () => {
  it("[DM15] the tile corner comes from the file name", () => {
    expect(hgtTileOrigin("N47E011.hgt")).toEqual({ latDeg: 47, lonDeg: 11 });
    expect(hgtTileOrigin("dir/S09W078.SRTMGL1.hgt")).toEqual({ latDeg: -9, lonDeg: -78 });
    expect(hgtTileOrigin("terrain.hgt")).toBeUndefined();
  });

  it("[DM16] 1″ and 3″ sizes are accepted, voids become NaN, other sizes are refused", async () => {
    const side = 1201;
    const buf = new ArrayBuffer(side * side * 2);
    const dv = new DataView(buf);
    for (let i = 0; i < side * side; i++) dv.setInt16(2 * i, 1234, false);
    // A site near 46.5° N, 15.5° E in UTM 33N, inside tile N46E015.
    const site: GridFrame = { ...frame, originX: 538_000, originY: 5_150_000 };
    const ok = readHgtDem(buf, "N46E015.hgt", site);
    expect(Array.from(ok.ground.data).every((v) => v === 1234)).toBe(true);
    for (let i = 0; i < side * side; i++) dv.setInt16(2 * i, -32768, false);
    const voids = await importError(() => readHgtDem(buf, "N46E015.hgt", site));
    expect(voids.message).toMatch(/does not cover any cell/);
    const wrong = await importError(() => readHgtDem(new ArrayBuffer(1000), "N46E015.hgt", site));
    expect(wrong.message).toMatch(/^N46E015\.hgt: 1000 bytes is neither a 1″ tile/);
    const unnamed = await importError(() => readHgtDem(buf, "tile.hgt", site));
    expect(unnamed.field).toBe("fileName");
  });

  it("[DM17] a tile that does not reach the site is refused", async () => {
    const buf = new ArrayBuffer(1201 * 1201 * 2);
    const e = await importError(() => readHgtDem(buf, "N10E010.hgt", frame));
    expect(e.message).toMatch(/^N10E010\.hgt: the DEM does not cover any cell/);
  });
});

describe("Esri ASCII grid", () => {
  const header = "ncols 4\nnrows 3\nxllcorner 499990\nyllcorner 5199900\ncellsize 40\nNODATA_value -9999\n";
  const values = "1 2 3 4\n5 6 7 8\n9 10 11 12\n";

  it("[DM18] without a .prj the site grid's CRS is assumed, and a warning says so", () => {
    const r = readAscDem(header + values, frame, undefined, { fileName: "a.asc" });
    expect(r.source.crs).toBe(UTM33);
    expect(r.warnings[0]).toMatch(
      /^a\.asc: no \.prj given; the grid is assumed to be in the site grid's CRS/,
    );
    // Cell (0, 0) centre (500 005, 5 199 995) lies at source column 15/40 − 0.5 = −0.125 (the outer
    // half-pixel rim: clamped to column 0) and row 25/40 − 0.5 = 0.125: 1 + 0.125 · (5 − 1) = 1.5.
    expect(r.ground.data[0]).toBeCloseTo(1.5, 5);
  });

  it("[DM19] xllcenter equals xllcorner + cellsize/2", () => {
    const centred = header
      .replace("xllcorner 499990", "xllcenter 500010")
      .replace("yllcorner 5199900", "yllcenter 5199920");
    const a = readAscDem(header + values, frame);
    const b = readAscDem(centred + values, frame);
    expect(Array.from(b.ground.data)).toEqual(Array.from(a.ground.data));
  });

  it("[DM20] missing header keys, bad numbers and short data name the file and the key", async () => {
    const missing = await importError(() =>
      readAscDem(header.replace("nrows 3\n", "") + values, frame, undefined, { fileName: "m.asc" }),
    );
    expect(missing.message).toBe("m.asc: nrows: missing header key");
    expect(
      (await importError(() => readAscDem(header.replace("cellsize 40\n", "") + values, frame))).field,
    ).toBe("cellsize");
    expect(
      (await importError(() => readAscDem(header.replace("xllcorner 499990\n", "") + values, frame))).field,
    ).toBe("xllcorner");
    const bad = await importError(() =>
      readAscDem(header.replace("cellsize 40", "cellsize forty") + values, frame),
    );
    expect(bad.field).toBe("cellsize");
    const short = await importError(() =>
      readAscDem(header + "1 2 3\n", frame, undefined, { fileName: "s.asc" }),
    );
    expect(short.message).toMatch(/promises 4 × 3 = 12 values but the file holds 3/);
    const word = await importError(() => readAscDem(header + values.replace("7", "x7"), frame));
    expect(word.field).toBe("row 2, column 3");
    // A key given twice (which holds is unclear) is refused, not read as the last one.
    const twice = await importError(() =>
      readAscDem(header.replace("nrows 3\n", "nrows 3\nncols 5\n") + values, frame, undefined, {
        fileName: "t.asc",
      }),
    );
    expect(twice.message).toBe("t.asc: ncols: given twice (header line 3): which one holds is unclear");
  });

  it('[DM6] a "nan" value (as GDAL writes NaN nodata) is nodata', () => {
    const r = readAscDem(header + values.replace("1 2 3 4", "nan 2 3 4"), frame);
    expect(Number.isNaN(r.ground.data[0])).toBe(true);
  });

  it("[DM21] a huge ncols × nrows is refused before any allocation", async () => {
    const e = await importError(() =>
      readAscDem(
        header.replace("ncols 4", "ncols 100000").replace("nrows 3", "nrows 100000") + values,
        frame,
      ),
    );
    expect(e.message).toContain(String(MAX_DEM_WINDOW_CELLS));
    // The key named is the one too large: a tall grid names nrows.
    const tall = await importError(() =>
      readAscDem(header.replace("ncols 4", "ncols 300").replace("nrows 3", "nrows 131072") + values, frame),
    );
    expect(tall.field).toBe("nrows");
    expect(
      (await importError(() => readAscDem(header.replace("ncols 4", "ncols 200000") + values, frame))).field,
    ).toBe("ncols");
    expect(
      (await importError(() => readAscDem(header.replace("ncols 4", "ncols -3") + values, frame))).field,
    ).toBe("ncols");
  });

  it("[DM22] an unreadable .prj is refused, naming it", async () => {
    const e = await importError(() =>
      readAscDem(header + values, frame, "PROJCS[garbage", { fileName: "p.asc" }),
    );
    expect(e.field).toBe("prj");
  });
});

describe("flat ground", () => {
  it("[DM23] flatGround fills the frame with one elevation", () => {
    const g = flatGround(frame, 212.5);
    expect(g.data.length).toBe(80);
    expect(Array.from(g.data).every((v) => v === 212.5)).toBe(true);
    expect(g.crs).toBe(UTM33);
  });
});

describe("fixture files read by the unit readers", () => {
  it("[DM24] the committed GDAL-made GeoTIFF declares EPSG:4326 and nodata −9999", async () => {
    const b = readFileSync(fileURLToPath(new URL("../fixtures/dem/src_geo.tif", import.meta.url)));
    const buf = b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
    const site: GridFrame = JSON.parse(
      readFileSync(fileURLToPath(new URL("../fixtures/dem/grid.json", import.meta.url)), "utf8"),
    ).grid;
    const r = await readGeoTiffDem(buf, site);
    expect(r.source.crs).toBe(crsFromEpsg(4326));
    expect(r.ground.data.some((v) => Number.isNaN(v))).toBe(true);
  });
});

describe("resampling edges", () => {
  it("[DM14] a geographic source on the other side of the Earth gives no value (longitudes wrap by whole turns)", () => {
    const src = {
      data: new Float32Array(4).fill(7),
      width: 2,
      height: 2,
      // 165° W = 195° E: the site at 15° E is half a turn away, whichever way the longitude is written.
      originX: -165,
      originY: 47,
      pixelSizeX: 1,
      pixelSizeY: 1,
      crs: "+proj=longlat +datum=WGS84 +no_defs",
    };
    const { coveredFraction } = resampleToFrame(src, frame);
    expect(coveredFraction).toBe(0);
  });

  it("[DM14] a geographic source written in 0–360° longitudes still lands on the site", () => {
    // The site lies near 15.0° E, 46.95° N; the source spans 374.9°–375.1° (= 14.9°–15.1° E).
    const src = {
      data: new Float32Array(400).fill(7),
      width: 20,
      height: 20,
      originX: 374.9,
      originY: 47.05,
      pixelSizeX: 0.01,
      pixelSizeY: 0.01,
      crs: "+proj=longlat +datum=WGS84 +no_defs",
    };
    const { grid, coveredFraction } = resampleToFrame(src, frame);
    expect(coveredFraction).toBe(1);
    expect(grid.data[0]).toBe(7);
  });
});

describe("row interpolation of the transform", () => {
  it("[DM1] interpolated source positions stay within 0.0001 pixel of exact proj4 transforms per cell", () => {
    // Source values = column + row of the lattice, so a value error is a position error in pixels.
    const n = 400;
    const data = new Float32Array(n * n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) data[r * n + c] = c + r;
    const source = {
      data,
      width: n,
      height: n,
      originX: 14.9,
      originY: 47.0,
      pixelSizeX: 0.0005,
      pixelSizeY: 0.0005,
      crs: "+proj=longlat +datum=WGS84 +no_defs",
    };
    // 37 columns: not a multiple of the interpolation step, so the last segment is short.
    const site: GridFrame = {
      width: 37,
      height: 40,
      originX: 495_000,
      originY: 5_205_000,
      cellSizeM: 97,
      crs: UTM33,
    };
    const { grid } = resampleToFrame(source, site);
    const toLonLat = proj4(UTM33, "EPSG:4326");
    let worst = 0;
    for (let row = 0; row < site.height; row++) {
      for (let col = 0; col < site.width; col++) {
        const [lon, lat] = toLonLat.forward([
          site.originX + (col + 0.5) * 97,
          site.originY - (row + 0.5) * 97,
        ]);
        const c = (lon - source.originX) / source.pixelSizeX - 0.5;
        const r = (source.originY - lat) / source.pixelSizeY - 0.5;
        worst = Math.max(worst, Math.abs(grid.data[row * site.width + col] - (c + r)));
      }
    }
    // 0.0001 px on each axis, plus Float32 rounding of values below 800 (< 1e-4).
    expect(worst).toBeLessThan(2e-4 + 1e-4);
  });
});
