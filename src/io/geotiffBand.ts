/**
 * Band 1 of a window of a GeoTIFF image, read block by block with typed-array copies.
 *
 * geotiff.js's `readRasters` reads every pixel through a DataView call (about 20 ns a pixel here, the
 * largest single cost of opening a 4 M-cell DEM). For the layouts DEMs use — one sample per pixel,
 * little-endian, 8/16/32-bit integers or 32/64-bit floats, no compression or one of TIFF's lossless
 * codecs — a decoded strip or tile is already a typed array in the file's sample type, so whole
 * row runs are copied with `TypedArray.set`. Every other layout goes through `readRasters`. The
 * decoding itself (inflate, LZW, PackBits, predictor) stays geotiff.js's.
 */
import { type GeoTIFFImage, getDecoder } from "geotiff";

/** TIFF Compression tag values whose geotiff.js decoder takes the default block parameters. */
const PLAIN_CODECS = new Set([1, 5, 8, 32773, 32946]);

type Window = [x0: number, y0: number, x1: number, y1: number];

type SampleArrayType =
  | typeof Uint8Array
  | typeof Uint16Array
  | typeof Uint32Array
  | typeof Int8Array
  | typeof Int16Array
  | typeof Int32Array
  | typeof Float32Array
  | typeof Float64Array;

/**
 * Typed arrays by TIFF SampleFormat (1 unsigned, 2 signed, 3 float) and BitsPerSample: the sample
 * layouts whose decoded bytes are the values as they stand (half floats, for one, are not).
 */
const SAMPLE_ARRAYS = new Map<string, SampleArrayType>([
  ["1/8", Uint8Array],
  ["1/16", Uint16Array],
  ["1/32", Uint32Array],
  ["2/8", Int8Array],
  ["2/16", Int16Array],
  ["2/32", Int32Array],
  ["3/32", Float32Array],
  ["3/64", Float64Array],
]);

/** The typed array of band 1's samples and the Compression tag, when blocks can be copied; else null. */
function copyLayout(image: GeoTIFFImage): { Samples: SampleArrayType; compression: number } | null {
  const compression = Number(image.fileDirectory.getValue("Compression") ?? 1);
  const Samples = SAMPLE_ARRAYS.get(`${image.getSampleFormat(0)}/${image.getBitsPerSample(0)}`);
  return image.littleEndian && image.getSamplesPerPixel() === 1 && PLAIN_CODECS.has(compression) && Samples
    ? { Samples, compression }
    : null;
}

/**
 * Band 1 of `window` (pixel columns x0…x1−1, rows y0…y1−1 of `image`), row-major, in the sample
 * type of the file (Float32Array for Float32 DEMs). Throws what geotiff.js throws for damaged data.
 */
export async function readBand1Window(image: GeoTIFFImage, window: Window): Promise<ArrayLike<number>> {
  const layout = copyLayout(image);
  if (layout === null) {
    const bands = await image.readRasters({ window, samples: [0], interleave: false });
    return bands[0] as ArrayLike<number>;
  }
  const { Samples, compression } = layout;
  const [x0, y0, x1, y1] = window;
  const outWidth = x1 - x0;
  const dir = image.fileDirectory;
  if (compression === 1) {
    const whole = await wholeRawImage(image, window, Samples);
    if (whole !== null) return whole;
  }
  const out = new Samples(outWidth * (y1 - y0));
  const tileWidth = image.getTileWidth();
  const tileHeight = image.getTileHeight();
  const decoder = await getDecoder(compression, {
    tileWidth,
    tileHeight,
    planarConfiguration: 1,
    bitsPerSample: image.getBitsPerSample(0),
    predictor: Number((await dir.loadValue("Predictor")) ?? 1),
  } as never);
  const bx0 = Math.floor(x0 / tileWidth);
  const bx1 = Math.ceil(x1 / tileWidth);
  const by0 = Math.floor(y0 / tileHeight);
  const by1 = Math.ceil(y1 / tileHeight);
  for (let by = by0; by < by1; by++) {
    for (let bx = bx0; bx < bx1; bx++) {
      const block = await image.getTileOrStrip(bx, by, 0, decoder);
      // Built here rather than by geotiff.js, whose `instanceof ArrayBuffer` test refuses buffers
      // of another realm.
      const values = new Samples(block.data as ArrayBuffer);
      const blockRows = image.getBlockHeight(by);
      const colStart = Math.max(x0, bx * tileWidth);
      const colEnd = Math.min(x1, (bx + 1) * tileWidth);
      const rowStart = Math.max(y0, by * tileHeight);
      const rowEnd = Math.min(y1, by * tileHeight + blockRows);
      for (let row = rowStart; row < rowEnd; row++) {
        const from = (row - by * tileHeight) * tileWidth + (colStart - bx * tileWidth);
        out.set(values.subarray(from, from + colEnd - colStart), (row - y0) * outWidth + colStart - x0);
      }
    }
  }
  return out;
}

/**
 * The whole image of an uncompressed file whose strips lie one after the other: one copy of that
 * byte run (as GDAL and Picket's own GeoTIFF export write them), else null.
 */
async function wholeRawImage(
  image: GeoTIFFImage,
  window: Window,
  Samples: SampleArrayType,
): Promise<ArrayLike<number> | null> {
  const width = image.getWidth();
  const height = image.getHeight();
  const [x0, y0, x1, y1] = window;
  if (image.isTiled || x0 !== 0 || y0 !== 0 || x1 !== width || y1 !== height) return null;
  const dir = image.fileDirectory;
  const offsets = (await dir.loadValue("StripOffsets")) as ArrayLike<number>;
  const counts = (await dir.loadValue("StripByteCounts")) as ArrayLike<number>;
  const bytes = Samples.BYTES_PER_ELEMENT * width * height;
  let end = Number(offsets[0]);
  for (let i = 0; i < offsets.length; i++) {
    if (Number(offsets[i]) !== end) return null;
    end += Number(counts[i]);
  }
  if (end - Number(offsets[0]) !== bytes) return null;
  const source = (
    image as unknown as { source: { fetch(s: { offset: number; length: number }[]): Promise<ArrayBuffer[]> } }
  ).source;
  const [run] = await source.fetch([{ offset: Number(offsets[0]), length: bytes }]);
  return new Samples(run);
}
