/**
 * GeoTIFF DEM import: reads only the window of band 1 that covers the site grid (a DEM of a whole
 * country must not be read whole), honours GDAL_NODATA, and resamples bilinearly to the site grid.
 * The CRS comes from the GeoKeys (ProjectedCSTypeGeoKey, else GeographicTypeGeoKey) as an EPSG
 * code: WGS 84 (4326), WGS 84 / UTM (326xx, 327xx) and ETRS89 / UTM (258xx) are built in, as is
 * any code already registered with proj4; others are refused, naming the code, unless the caller
 * passes the CRS as a proj4 string or WKT.
 */
import { fromArrayBuffer, type GeoTIFF, type GeoTIFFImage } from "geotiff";
import proj4 from "proj4";
import {
  FOOT_M,
  MAX_DEM_HEADER_SIDE_CELLS,
  MAX_DEM_WINDOW_CELLS,
  US_SURVEY_FOOT_M,
} from "../coverage/constants.ts";
import type { GridFrame } from "../coverage/grid.ts";
import {
  type DemResult,
  demResultFromSource,
  frameBoundsInCrs,
  importedSourceMeta,
  isGeographicCrs,
  type SourceRaster,
  type SurfaceKind,
} from "./demResample.ts";
import { readBand1Window } from "./geotiffBand.ts";
import { errorText, ImportError, isImportError } from "./importErrors.ts";

/** Options for reading a GeoTIFF DEM. */
export interface GeoTiffDemOptions {
  /** The file name shown in messages (default "DEM GeoTIFF"). */
  fileName?: string;
  /** The CRS as a proj4 string or WKT, overriding (or supplying) the file's GeoKeys. */
  crs?: string;
  /** Bare earth or surface model, if the user knows. */
  surfaceKind?: SurfaceKind;
}

/** The file name in messages when the caller gives none. */
const DEFAULT_FILE_NAME = "DEM GeoTIFF";

// GeoTIFF 1.1 (OGC 19-008r4) key values used below.
const MODEL_TYPE_PROJECTED = 1;
const MODEL_TYPE_GEOGRAPHIC = 2;
const RASTER_PIXEL_IS_POINT = 2;
const USER_DEFINED = 32767;
// EPSG unit-of-measure codes.
const EPSG_UNIT_METRE = 9001;
const EPSG_UNIT_FOOT = 9002;
const EPSG_UNIT_US_SURVEY_FOOT = 9003;
// TIFF 6.0 NewSubfileType bit 0: a reduced-resolution version (overview) of another image.
const SUBFILE_REDUCED_RESOLUTION = 1;

/**
 * proj4 string (or registered proj4 name) for an EPSG code, or undefined when it is not built in.
 * Built in: 4326 (WGS 84), 32601–32660 / 32701–32760 (WGS 84 / UTM N / S), 25828–25838 (ETRS89 / UTM).
 */
export function crsFromEpsg(code: number): string | undefined {
  if (code === 4326) return "+proj=longlat +datum=WGS84 +no_defs";
  if (code >= 32601 && code <= 32660) return `+proj=utm +zone=${code - 32600} +datum=WGS84 +units=m +no_defs`;
  if (code >= 32701 && code <= 32760) {
    return `+proj=utm +zone=${code - 32700} +south +datum=WGS84 +units=m +no_defs`;
  }
  if (code >= 25828 && code <= 25838) {
    return `+proj=utm +zone=${code - 25800} +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs`;
  }
  const name = `EPSG:${code}`;
  return proj4.defs(name) ? name : undefined;
}

/** Can proj4 build a transform from this CRS text? */
function parsesInProj4(crs: string): boolean {
  try {
    proj4.Proj(crs);
    return true;
  } catch {
    return false;
  }
}

/** The text of a GeoKey's value for a message ("missing" when absent or empty). */
function keyText(value: unknown): string {
  return value === undefined || value === null || value === "" ? "missing" : String(value);
}

/**
 * The image's GeoKeys, or null when it has none. A GeoKeyDirectory whose keys point at a params tag
 * the file lacks (GeoAsciiParams, GeoDoubleParams) is a damaged file: ImportError naming the directory.
 */
export function geoKeysOf(image: GeoTIFFImage, file: string): Record<string, unknown> | null {
  try {
    return image.getGeoKeys() ?? null;
  } catch (e) {
    throw new ImportError(file, `damaged GeoKeys (${errorText(e)})`, "GeoKeyDirectory");
  }
}

/** The CRS of an image from its GeoKeys, or an ImportError naming the key and the code. */
function crsOfImage(image: GeoTIFFImage, file: string): string {
  const keys = geoKeysOf(image, file);
  if (!keys) throw new ImportError(file, "no GeoKeys: the TIFF is not georeferenced", "GeoKeyDirectory");
  const modelType = Number(keys.GTModelTypeGeoKey);
  const projected = Number(keys.ProjectedCSTypeGeoKey);
  const geographic = Number(keys.GeographicTypeGeoKey);
  let key: string;
  let code: number;
  const modelStated = keys.GTModelTypeGeoKey !== undefined;
  if (modelType === MODEL_TYPE_PROJECTED || (!modelStated && Number.isFinite(projected))) {
    key = "ProjectedCSTypeGeoKey";
    code = projected;
  } else if (modelType === MODEL_TYPE_GEOGRAPHIC || (!modelStated && Number.isFinite(geographic))) {
    key = "GeographicTypeGeoKey";
    code = geographic;
  } else {
    throw new ImportError(
      file,
      `model type ${keyText(keys.GTModelTypeGeoKey)} is neither projected (1) nor geographic (2)`,
      "GTModelTypeGeoKey",
    );
  }
  if (!Number.isFinite(code)) throw new ImportError(file, "missing: the CRS of the DEM is not stated", key);
  if (code === USER_DEFINED) {
    throw new ImportError(
      file,
      "user-defined CRS (32767) with no EPSG code; supply the DEM's CRS as WKT or a proj4 string",
      key,
    );
  }
  const crs = crsFromEpsg(code);
  if (crs === undefined) {
    throw new ImportError(
      file,
      `EPSG:${code} is not a built-in CRS (built in: 4326, 326xx/327xx WGS 84 / UTM, 258xx ETRS89 / UTM); ` +
        "reproject the DEM to one of these or supply its CRS as WKT or a proj4 string",
      key,
    );
  }
  return crs;
}

/** Factor from the file's vertical unit to metres (VerticalUnitsGeoKey), with a warning if unknown. */
function verticalScale(image: GeoTIFFImage, file: string, warnings: string[]): number {
  const unit = Number(geoKeysOf(image, file)?.VerticalUnitsGeoKey);
  if (!Number.isFinite(unit) || unit === EPSG_UNIT_METRE) return 1;
  if (unit === EPSG_UNIT_FOOT) return FOOT_M;
  if (unit === EPSG_UNIT_US_SURVEY_FOOT) return US_SURVEY_FOOT_M;
  warnings.push(`${file}: vertical unit EPSG:${unit} is not known; elevations are taken as metres.`);
  return 1;
}

/**
 * Georeferencing of a north-up image: pixel-edge origin and pixel sizes in CRS units (both sizes
 * positive; y runs south). ImportError naming the tag for none, a rotated one, or a degenerate one.
 */
export function geotransformOf(
  image: GeoTIFFImage,
  file: string,
): { originX: number; originY: number; pixelSizeX: number; pixelSizeY: number } {
  const dir = image.fileDirectory;
  const transform = dir.getValue("ModelTransformation") as ArrayLike<number> | undefined;
  let originX: number;
  let originY: number;
  let pixelSizeX: number;
  let pixelSizeY: number;
  if (transform && transform.length >= 8) {
    if (transform[1] !== 0 || transform[4] !== 0) {
      throw new ImportError(
        file,
        "rotated or sheared rasters are not supported; warp it north-up first",
        "ModelTransformation",
      );
    }
    pixelSizeX = transform[0];
    pixelSizeY = -transform[5];
    originX = transform[3];
    originY = transform[7];
  } else {
    try {
      const origin = image.getOrigin();
      const resolution = image.getResolution();
      originX = origin[0];
      originY = origin[1];
      pixelSizeX = resolution[0];
      pixelSizeY = -resolution[1];
    } catch {
      // Name the tag that is missing (or unreadable) of the pair.
      const tag = dir.hasTag("ModelTiepoint") ? "ModelPixelScale" : "ModelTiepoint";
      throw new ImportError(
        file,
        "no georeferencing (ModelTiepoint with ModelPixelScale, or ModelTransformation)",
        tag,
      );
    }
  }
  if (!(pixelSizeX > 0) || !(pixelSizeY > 0) || !Number.isFinite(originX) || !Number.isFinite(originY)) {
    throw new ImportError(
      file,
      `pixel size ${pixelSizeX} × ${pixelSizeY} at origin (${originX}, ${originY}) is not a north-up raster`,
      "ModelPixelScale",
    );
  }
  const rasterType = Number(geoKeysOf(image, file)?.GTRasterTypeGeoKey);
  if (rasterType === RASTER_PIXEL_IS_POINT) {
    // The tie point names a pixel centre: shift to the pixel edge (GDAL's default reading).
    originX -= 0.5 * pixelSizeX;
    originY += 0.5 * pixelSizeY;
  }
  return { originX, originY, pixelSizeX, pixelSizeY };
}

// Image directories followed along a TIFF's chain (main image, overviews, masks); more is no DEM.
const IMAGE_DIRECTORIES_MAX = 64;
const TIFF_MAGIC_CLASSIC = 42;
const TIFF_MAGIC_BIG = 43;
const CLASSIC_ENTRY_BYTES = 12;
const BIG_ENTRY_BYTES = 20;

/**
 * The number of image directories (IFDs) in a TIFF, walking the chain in the raw bytes (TIFF 6.0
 * §2; BigTIFF). A chain that loops back, points past the end, or runs beyond IMAGE_DIRECTORIES_MAX
 * is refused here, before the decoder would follow it forever.
 */
export function countImageDirectories(buffer: ArrayBuffer, file: string): number {
  const dv = new DataView(buffer);
  if (buffer.byteLength < 8) throw new ImportError(file, `not a readable TIFF (${buffer.byteLength} bytes)`);
  const order = dv.getUint16(0, false);
  const little = order === 0x4949; // "II"
  if (!little && order !== 0x4d4d)
    throw new ImportError(file, "not a readable TIFF (no II/MM byte-order mark)");
  const magic = dv.getUint16(2, little);
  const big = magic === TIFF_MAGIC_BIG;
  if (!big && magic !== TIFF_MAGIC_CLASSIC)
    throw new ImportError(file, `not a readable TIFF (magic number ${magic})`);
  const u64 = (at: number) => Number(dv.getBigUint64(at, little));
  if (big && buffer.byteLength < 16)
    throw new ImportError(file, "not a readable TIFF (truncated BigTIFF header)");
  let offset = big ? u64(8) : dv.getUint32(4, little);
  const seen = new Set<number>();
  while (offset !== 0) {
    if (seen.has(offset))
      throw new ImportError(file, "damaged TIFF: the chain of image directories loops back on itself");
    if (seen.size >= IMAGE_DIRECTORIES_MAX) {
      throw new ImportError(file, `more than ${IMAGE_DIRECTORIES_MAX} image directories: not a DEM`);
    }
    const headBytes = big ? 8 : 2;
    if (offset + headBytes > buffer.byteLength) {
      throw new ImportError(
        file,
        `the file is truncated: image directory at byte ${offset} of ${buffer.byteLength}`,
      );
    }
    seen.add(offset);
    const entries = big ? u64(offset) : dv.getUint16(offset, little);
    const next = offset + headBytes + entries * (big ? BIG_ENTRY_BYTES : CLASSIC_ENTRY_BYTES);
    const nextBytes = big ? 8 : 4;
    if (next + nextBytes > buffer.byteLength) {
      throw new ImportError(
        file,
        `the file is truncated: image directory at byte ${offset} runs past the end`,
      );
    }
    offset = big ? u64(next) : dv.getUint32(next, little);
  }
  if (seen.size === 0) throw new ImportError(file, "not a readable TIFF (no image directory)");
  return seen.size;
}

/**
 * Refuse an image whose strips or tiles cannot all be read: an offsets or byte-counts array stored
 * past the end of the file, fewer blocks listed than the image's size and block size need (the rest
 * would read as zeros), or blocks that run past the end (a truncated file).
 */
async function checkBlocks(image: GeoTIFFImage, byteLength: number, file: string): Promise<void> {
  const dir = image.fileDirectory;
  const tiled = dir.hasTag("TileOffsets");
  const offsetsTag = tiled ? "TileOffsets" : "StripOffsets";
  const countsTag = tiled ? "TileByteCounts" : "StripByteCounts";
  const load = async (tag: typeof offsetsTag | typeof countsTag) => {
    try {
      const v = (await dir.loadValue(tag)) as ArrayLike<number> | number | undefined;
      return typeof v === "number" ? [v] : v;
    } catch (e) {
      throw new ImportError(
        file,
        `the file is truncated or damaged: this tag's values cannot be read (${errorText(e)})`,
        tag,
      );
    }
  };
  const offsetList = await load(offsetsTag);
  const countList = await load(countsTag);
  if (offsetList === undefined || countList === undefined) {
    throw new ImportError(file, "missing: the TIFF has no image data", offsetsTag);
  }
  const cols = image.getTileWidth();
  const rows = image.getTileHeight();
  const across = Math.ceil(image.getWidth() / cols);
  const down = Math.ceil(image.getHeight() / rows);
  const planes = Number(dir.getValue("PlanarConfiguration") ?? 1) === 2 ? image.getSamplesPerPixel() : 1;
  const needed = across * down * planes;
  if (offsetList.length < needed || countList.length < needed) {
    const layout = tiled
      ? `${across} × ${down} tiles of ${cols} × ${rows} pixels`
      : `${down} strips of ${rows} row${rows === 1 ? "" : "s"} (RowsPerStrip ${rows})`;
    throw new ImportError(
      file,
      `damaged TIFF: the image needs ${needed} blocks (${layout}) but ${Math.min(offsetList.length, countList.length)} are listed`,
      offsetList.length < needed ? offsetsTag : countsTag,
    );
  }
  let end = 0;
  for (let i = 0; i < offsetList.length; i++) {
    const e = Number(offsetList[i]) + Number(countList[i] ?? 0);
    if (e > end) end = e;
  }
  if (end > byteLength) {
    throw new ImportError(
      file,
      `the file is truncated: image data runs to byte ${end} but the file has ${byteLength} bytes`,
    );
  }
}

/** Pixel window [c0, r0, c1, r1) of an image covering the site frame with a one-pixel margin. */
function windowFor(
  frame: GridFrame,
  crs: string,
  gt: { originX: number; originY: number; pixelSizeX: number; pixelSizeY: number },
  width: number,
  height: number,
): [number, number, number, number] {
  const b = frameBoundsInCrs(frame, crs);
  const c0 = Math.max(0, Math.floor((b.minX - gt.originX) / gt.pixelSizeX) - 1);
  const c1 = Math.min(width, Math.ceil((b.maxX - gt.originX) / gt.pixelSizeX) + 1);
  const r0 = Math.max(0, Math.floor((gt.originY - b.maxY) / gt.pixelSizeY) - 1);
  const r1 = Math.min(height, Math.ceil((gt.originY - b.minY) / gt.pixelSizeY) + 1);
  return [c0, r0, c1, r1];
}

/**
 * The coarsest overview still at least as fine as the site grid over the window (fewer bytes to
 * decode, same answer within the overview's own averaging), else the full-resolution image.
 */
async function pickImage(
  tiff: GeoTIFF,
  main: GeoTIFFImage,
  count: number,
  windowCols: number,
  frame: GridFrame,
): Promise<{ image: GeoTIFFImage; factor: number }> {
  let best = { image: main, factor: 1 };
  const sourcePixelsPerCell = windowCols / Math.max(1, frame.width);
  for (let i = 1; i < count; i++) {
    const image = await tiff.getImage(i);
    const subfile = Number(image.fileDirectory.getValue("NewSubfileType") ?? 0);
    if ((subfile & SUBFILE_REDUCED_RESOLUTION) === 0) continue;
    const factor = main.getWidth() / image.getWidth();
    if (factor <= sourcePixelsPerCell && factor > best.factor) best = { image, factor };
  }
  return best;
}

/** Samples as metres: × `scale`, NaN for the nodata value (either precision) and NaN samples. */
function elevationsM(
  raw: ArrayLike<number>,
  cells: number,
  nodata: number | null,
  nodata32: number | null,
  scale: number,
): Float32Array {
  if (raw instanceof Float32Array && scale === 1) {
    // The common Float32 DEM in metres: only the nodata value changes, in place.
    if (nodata32 !== null) for (let i = 0; i < cells; i++) if (raw[i] === nodata32) raw[i] = Number.NaN;
    return raw;
  }
  const data = new Float32Array(cells);
  for (let i = 0; i < cells; i++) {
    const v = raw[i];
    data[i] = v === nodata || v === nodata32 || Number.isNaN(v) ? Number.NaN : v * scale;
  }
  return data;
}

/**
 * Read a GeoTIFF DEM (band 1) and resample it bilinearly to the site frame.
 * Only the window that covers the frame is decoded. Elevations are converted to metres
 * (VerticalUnitsGeoKey), GDAL_NODATA and NaN become NaN. Throws ImportError (naming the file and the
 * tag or key) for a damaged or truncated file, a header above MAX_DEM_HEADER_SIDE_CELLS per side,
 * a window above MAX_DEM_WINDOW_CELLS, an unknown or missing CRS, or a DEM that covers no cell.
 * Anything else the decoder throws on a damaged file becomes an ImportError too, never a crash.
 */
export async function readGeoTiffDem(
  buffer: ArrayBuffer,
  frame: GridFrame,
  options: GeoTiffDemOptions = {},
): Promise<DemResult> {
  try {
    return await readGeoTiffDemWindow(buffer, frame, options);
  } catch (e) {
    if (isImportError(e)) throw e;
    throw new ImportError(options.fileName ?? DEFAULT_FILE_NAME, `damaged TIFF (${errorText(e)})`);
  }
}

/** readGeoTiffDem's work; its own checks throw ImportError, the decoder may throw anything. */
async function readGeoTiffDemWindow(
  buffer: ArrayBuffer,
  frame: GridFrame,
  options: GeoTiffDemOptions = {},
): Promise<DemResult> {
  const file = options.fileName ?? DEFAULT_FILE_NAME;
  const warnings: string[] = [];
  const imageCount = countImageDirectories(buffer, file);
  let tiff: GeoTIFF;
  let main: GeoTIFFImage;
  try {
    tiff = await fromArrayBuffer(buffer);
    main = await tiff.getImage(0);
  } catch (e) {
    throw new ImportError(file, `not a readable TIFF (${errorText(e)})`);
  }
  const width = main.getWidth();
  const height = main.getHeight();
  if (!(width >= 1 && height >= 1))
    throw new ImportError(file, `image size ${width} × ${height} is empty`, "ImageWidth");
  if (width > MAX_DEM_HEADER_SIDE_CELLS || height > MAX_DEM_HEADER_SIDE_CELLS) {
    throw new ImportError(
      file,
      `image size ${width} × ${height} exceeds the ${MAX_DEM_HEADER_SIDE_CELLS} cells per side accepted; ` +
        "cut the DEM to the site first",
      width > MAX_DEM_HEADER_SIDE_CELLS ? "ImageWidth" : "ImageLength",
    );
  }
  let crs: string;
  if (options.crs !== undefined) {
    if (!parsesInProj4(options.crs))
      throw new ImportError(file, "the CRS given is not one proj4 can read", "crs");
    crs = options.crs;
  } else {
    crs = crsOfImage(main, file);
  }
  const gt = geotransformOf(main, file);
  const scale = verticalScale(main, file, warnings);
  if (main.getSamplesPerPixel() > 1) {
    warnings.push(`${file}: ${main.getSamplesPerPixel()} bands; band 1 is used as elevation.`);
  }
  let window: [number, number, number, number];
  try {
    window = windowFor(frame, crs, gt, width, height);
  } catch (e) {
    throw new ImportError(
      file,
      `cannot transform the site grid into the DEM's CRS (${(e as Error).message})`,
      "crs",
    );
  }
  const [c0, r0, c1, r1] = window;
  if (!(c1 > c0 && r1 > r0)) {
    throw new ImportError(
      file,
      `the DEM (${width} × ${height} pixels from (${gt.originX}, ${gt.originY}) in ${crs}) does not overlap the site grid`,
    );
  }
  const { image, factor } = await pickImage(tiff, main, imageCount, c1 - c0, frame);
  // Overview pixel sizes follow from the extent over the overview's own size, per axis.
  const factorX = width / image.getWidth();
  const factorY = height / image.getHeight();
  const w0 = Math.floor(c0 / factorX);
  const h0 = Math.floor(r0 / factorY);
  const w1 = Math.min(image.getWidth(), Math.ceil(c1 / factorX));
  const h1 = Math.min(image.getHeight(), Math.ceil(r1 / factorY));
  const cells = (w1 - w0) * (h1 - h0);
  if (cells > MAX_DEM_WINDOW_CELLS) {
    throw new ImportError(
      file,
      `the part covering the site is ${w1 - w0} × ${h1 - h0} = ${cells} pixels, above the ${MAX_DEM_WINDOW_CELLS} ` +
        "read at once; use a coarser DEM, one with overviews, or a smaller site",
    );
  }
  await checkBlocks(image, buffer.byteLength, file);
  // Each strip or tile is decoded whole: a hostile header could make one block alone enormous.
  const blockCells = image.getTileWidth() * image.getTileHeight();
  if (!(blockCells <= MAX_DEM_WINDOW_CELLS)) {
    throw new ImportError(
      file,
      `one strip or tile of ${image.getTileWidth()} × ${image.getTileHeight()} pixels is above the ${MAX_DEM_WINDOW_CELLS} read at once`,
      image.fileDirectory.hasTag("TileWidth") ? "TileWidth" : "RowsPerStrip",
    );
  }
  let raw: ArrayLike<number>;
  try {
    raw = await readBand1Window(image, [w0, h0, w1, h1]);
  } catch (e) {
    throw new ImportError(file, `could not decode the image data (${errorText(e)}); the file may be damaged`);
  }
  const nodata = main.getGDALNoData();
  // A Float32 band stores the nodata value rounded to single precision.
  const nodata32 = nodata === null ? null : Math.fround(nodata);
  const data = elevationsM(raw, cells, nodata, nodata32, scale);
  const source: SourceRaster = {
    data,
    width: w1 - w0,
    height: h1 - h0,
    pixelSizeX: gt.pixelSizeX * factorX,
    pixelSizeY: gt.pixelSizeY * factorY,
    originX: gt.originX + w0 * gt.pixelSizeX * factorX,
    originY: gt.originY - h0 * gt.pixelSizeY * factorY,
    crs,
  };
  if (isGeographicCrs(crs)) {
    warnings.push(`${file}: geographic DEM (degrees) reprojected bilinearly to the site grid.`);
  }
  if (factor > 1)
    warnings.push(
      `${file}: read from an overview at 1/${factor.toFixed(1)} resolution (finer than the site grid).`,
    );
  return demResultFromSource(
    source,
    frame,
    file,
    importedSourceMeta("geotiff", crs, options.surfaceKind),
    warnings,
  );
}
