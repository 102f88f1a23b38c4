/**
 * readBand1Window against geotiff.js's own readRasters (the generic per-pixel path) on GDAL 3.6.2
 * files of every block layout a DEM comes in (tests/fixtures/geotiffBand/make_fixtures.sh): values
 * equal bit for bit, and in the file's sample type, for windows inside blocks, across block edges and
 * over the whole image.
 */
import { readFileSync } from "node:fs";
import { fromArrayBuffer, GeoTIFFImage } from "geotiff";
import { describe, expect, it, vi } from "vitest";
import { readBand1Window } from "../../src/io/geotiffBand.ts";

const DIR = new URL("../fixtures/geotiffBand/", import.meta.url);
const LAYOUTS = [
  "f32_strip_none",
  "f32_tile_deflate",
  "i16_strip_lzw",
  "f64_tile_none",
  "u8_strip_packbits",
  "f32_strip_bigendian",
  "f32_pixel_two_bands",
];
const WINDOWS: [number, number, number, number][] = [
  [0, 0, 70, 45],
  [3, 2, 9, 5],
  [17, 6, 53, 40],
  [69, 44, 70, 45],
];

async function open(name: string): Promise<GeoTIFFImage> {
  const b = readFileSync(new URL(`${name}.tif`, DIR));
  return (await fromArrayBuffer(b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength))).getImage(0);
}

describe("band 1 of a GeoTIFF window, block by block", () => {
  for (const name of LAYOUTS) {
    it(`${name}: equals geotiff.js readRasters for every window`, async () => {
      const image = await open(name);
      for (const window of WINDOWS) {
        const ours = await readBand1Window(image, window);
        const ref = (await image.readRasters({ window, samples: [0], interleave: false }))[0];
        expect(ours.constructor).toBe(ref.constructor);
        expect(Array.from(ours)).toEqual(Array.from(ref as ArrayLike<number>));
      }
    });
  }

  it("the ramp GDAL wrote is what comes back (value at column 30, row 20 and the nodata hole)", async () => {
    const image = await open("f32_tile_deflate");
    const all = await readBand1Window(image, [0, 0, 70, 45]);
    // make_fixtures.sh: 100 + 3.25 x − 1.5 y + 0.01 x y, −9999 over rows 10–13, columns 20–24.
    expect(all[20 * 70 + 30]).toBe(Math.fround(100 + 3.25 * 30 - 1.5 * 20 + 0.01 * 30 * 20));
    expect(all[12 * 70 + 22]).toBe(-9999);
  });

  it("reads an uncompressed image whose strips follow one another as one byte run", async () => {
    const spy = vi.spyOn(GeoTIFFImage.prototype, "getTileOrStrip");
    const image = await open("f32_strip_none");
    const all = await readBand1Window(image, [0, 0, 70, 45]);
    expect(spy).not.toHaveBeenCalled();
    expect(all[20 * 70 + 30]).toBe(Math.fround(100 + 3.25 * 30 - 1.5 * 20 + 0.01 * 30 * 20));
    await readBand1Window(image, [3, 2, 9, 5]); // a window: block by block
    expect(spy).toHaveBeenCalled();
    spy.mockRestore();
  });

  it("copies blocks for plain little-endian layouts and leaves the others to readRasters", async () => {
    const spy = vi.spyOn(GeoTIFFImage.prototype, "readRasters");
    await readBand1Window(await open("i16_strip_lzw"), [0, 0, 70, 45]);
    expect(spy).not.toHaveBeenCalled();
    await readBand1Window(await open("f32_strip_bigendian"), [0, 0, 70, 45]);
    await readBand1Window(await open("f32_pixel_two_bands"), [0, 0, 70, 45]);
    expect(spy).toHaveBeenCalledTimes(2);
    spy.mockRestore();
  });
});
