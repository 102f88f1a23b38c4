/**
 * DEM import and bilinear resampling against GDAL 3.6.2 (`gdalwarp -r bilinear -et 0`), on the
 * committed fixtures of tests/fixtures/dem (generator: make_fixtures.py, versions in grid.json).
 * Three sources: a geographic GeoTIFF with GDAL_NODATA, an SRTM 3″ .hgt tile (zipped) with voids,
 * and an Esri ASCII grid in a neighbouring UTM zone with a .prj — each onto one UTM 32N site grid.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { fromArrayBuffer, GeoTIFFImage } from "geotiff";
import { describe, expect, it, vi } from "vitest";
import type { GridFrame } from "../../src/coverage/grid.ts";
import { readAscDem } from "../../src/io/demAsc.ts";
import { readGeoTiffDem } from "../../src/io/demGeotiff.ts";
import { readHgtDem } from "../../src/io/demHgt.ts";
import type { DemResult } from "../../src/io/demResample.ts";

const dir = fileURLToPath(new URL("../fixtures/dem/", import.meta.url));
const meta = JSON.parse(readFileSync(`${dir}grid.json`, "utf8")) as { gdalVersion: string; grid: GridFrame };
const frame = meta.grid;

function bytes(name: string): ArrayBuffer {
  const b = readFileSync(dir + name);
  return b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
}

async function band(name: string): Promise<Float32Array> {
  const tiff = await fromArrayBuffer(bytes(name));
  const image = await tiff.getImage();
  expect(image.getWidth()).toBe(frame.width);
  expect(image.getHeight()).toBe(frame.height);
  const [data] = await image.readRasters({ interleave: false });
  return data as Float32Array;
}

/**
 * Tolerance 0.01 m: both sides interpolate the same Float32 samples with the same weights; the
 * differences are the Float32 rounding of GDAL's output (~6e-5 m at 1000 m), proj4js against PROJ
 * for the UTM/geographic transform (well under 1 mm in position), and our row interpolation of the
 * transform (≤ 1e-4 source pixel, checked at each segment's middle) times the fixture's steepest
 * slope of about 20 m per pixel: ≤ 2 mm. Measured worst: 0.9 mm.
 */
const TOLERANCE_M = 0.01;

async function compare(result: DemResult, name: string) {
  const ref = await band(`ref_${name}.tif`);
  const mask = await band(`mask_${name}.tif`);
  const ours = result.ground.data;
  let compared = 0;
  let maxErr = 0;
  let nanMismatch = 0;
  for (let i = 0; i < ours.length; i++) {
    if (mask[i] === 1) {
      // Every bilinear neighbour valid for GDAL: ours must have a value and agree.
      if (Number.isNaN(ours[i]) || Number.isNaN(ref[i])) {
        nanMismatch++;
        continue;
      }
      maxErr = Math.max(maxErr, Math.abs(ours[i] - ref[i]));
      compared++;
    } else if (mask[i] < 1 || Number.isNaN(mask[i])) {
      // Next to nodata (GDAL renormalises its weights there) or outside: ours is nodata.
      if (!Number.isNaN(ours[i])) nanMismatch++;
    }
  }
  return { compared, maxErr, nanMismatch, total: ours.length };
}

describe(`DEM resampling against GDAL ${meta.gdalVersion} gdalwarp -r bilinear`, () => {
  it("[DM1] geographic GeoTIFF (EPSG:4326, GDAL_NODATA) onto a UTM grid matches gdalwarp", async () => {
    const result = await readGeoTiffDem(bytes("src_geo.tif"), frame, { fileName: "src_geo.tif" });
    const c = await compare(result, "geo");
    expect(c.compared).toBeGreaterThan(0.9 * c.total);
    expect(c.nanMismatch).toBe(0);
    expect(c.maxErr).toBeLessThan(TOLERANCE_M);
    expect(result.source.crs).toContain("longlat");
    expect(result.warnings.join(" ")).toMatch(/geographic DEM \(degrees\) reprojected/);
  });

  it("[DM2] only the window covering the site is decoded from a larger GeoTIFF", async () => {
    const spy = vi.spyOn(GeoTIFFImage.prototype, "getTileOrStrip");
    await readGeoTiffDem(bytes("src_geo.tif"), frame, { fileName: "src_geo.tif" });
    // The source is 160 × 120 pixels in 3 × 2 tiles of 64²; the 3 km × 2.5 km site spans about
    // 48 × 27 pixels, so at most 4 tiles (a window across a tile corner) are decoded, each once.
    const tiles = spy.mock.calls.map(([x, y]) => `${x},${y}`);
    expect(tiles.length).toBeGreaterThan(0);
    expect(tiles.length).toBeLessThanOrEqual(4);
    expect(new Set(tiles).size).toBe(tiles.length);
    spy.mockRestore();
  });

  it("[DM1] the same DEM as BigTIFF (64-bit offsets) matches gdalwarp too", async () => {
    const result = await readGeoTiffDem(bytes("src_geo_bigtiff.tif"), frame, {
      fileName: "src_geo_bigtiff.tif",
    });
    const c = await compare(result, "geo");
    expect(c.compared).toBeGreaterThan(0.9 * c.total);
    expect(c.nanMismatch).toBe(0);
    expect(c.maxErr).toBeLessThan(TOLERANCE_M);
  });

  it("[DM2] an overview is used only when it is still finer than the site grid", async () => {
    // On the 25 m grid (finer than the 63 m × 93 m pixels) the full resolution is read: same as gdalwarp.
    const fine = await readGeoTiffDem(bytes("src_geo_ovr.tif"), frame, { fileName: "src_geo_ovr.tif" });
    expect(fine.warnings.join(" ")).not.toMatch(/overview/);
    expect((await compare(fine, "geo")).maxErr).toBeLessThan(TOLERANCE_M);
    // On a 400 m grid over the same area, 4 source pixels and more fall in a cell: the 1/4 overview is read.
    const coarse: GridFrame = { ...frame, width: 8, height: 7, cellSizeM: 400 };
    const spy = vi.spyOn(GeoTIFFImage.prototype, "getTileOrStrip");
    const r = await readGeoTiffDem(bytes("src_geo_ovr.tif"), coarse, { fileName: "src_geo_ovr.tif" });
    expect(r.warnings.join(" ")).toMatch(/overview at 1\/4\.0 resolution/);
    // Every block decoded belongs to the 40 × 30-pixel overview, none to the full image.
    expect(spy.mock.contexts.length).toBeGreaterThan(0);
    for (const image of spy.mock.contexts) expect((image as GeoTIFFImage).getWidth()).toBe(40);
    spy.mockRestore();
  });

  it("[DM3] SRTM 3″ tile (zipped .hgt, voids) onto a UTM grid matches gdalwarp", async () => {
    const result = readHgtDem(bytes("N47E011.hgt.zip"), "N47E011.hgt.zip", frame);
    const c = await compare(result, "hgt");
    expect(c.compared).toBeGreaterThan(0.9 * c.total);
    expect(c.nanMismatch).toBe(0);
    expect(c.maxErr).toBeLessThan(TOLERANCE_M);
    expect(result.source.surfaceKind).toBe("dsm");
  });

  it("[DM4] Esri ASCII grid in UTM 33N with a .prj onto a UTM 32N grid matches gdalwarp", async () => {
    const text = readFileSync(`${dir}src_utm33.asc`, "utf8");
    const prj = readFileSync(`${dir}src_utm33.prj`, "utf8");
    const result = readAscDem(text, frame, prj, { fileName: "src_utm33.asc" });
    const c = await compare(result, "asc");
    expect(c.compared).toBeGreaterThan(0.9 * c.total);
    expect(c.nanMismatch).toBe(0);
    expect(c.maxErr).toBeLessThan(TOLERANCE_M);
  });
});
