/**
 * GeoTIFF export of site-grid rasters, so GIS tools (QGIS, GDAL) place them where they belong.
 * One band per file, Float32 or Uint8, a north-up grid in a UTM zone on WGS 84.
 * GeoKeys follow the OGC GeoTIFF 1.1 standard (OGC 19-008r4): GTModelTypeGeoKey = 1 (projected),
 * GTRasterTypeGeoKey = 1 (PixelIsArea), ProjectedCSTypeGeoKey = the EPSG code of the UTM zone;
 * ModelTiepointTag ties pixel corner (0, 0) to the grid origin, ModelPixelScaleTag gives the cell size.
 * Nodata is written as the GDAL_NODATA tag (TIFF tag 42113, an ASCII value, "nan" for Float32).
 * Our own minimal writer (geotiff.js's writer takes over a second for 4 M cells): one IFD, one strip.
 */
import type { GridFrame } from "../coverage/grid.ts";

/** EPSG codes of the WGS 84 / UTM zones: 326zz north, 327zz south (EPSG registry). */
const EPSG_UTM_NORTH_BASE = 32600;
const EPSG_UTM_SOUTH_BASE = 32700;
const UTM_ZONE_COUNT = 60;

/** GeoTIFF key values (OGC 19-008r4, tables of GTModelTypeGeoKey and GTRasterTypeGeoKey). */
const MODEL_TYPE_PROJECTED = 1;
const RASTER_TYPE_PIXEL_IS_AREA = 1;

/** A raster export failed for a reason the caller can show (name "ExportError"). */
export class ExportError extends Error {
  override name = "ExportError";
}

/**
 * The EPSG code of a proj4 UTM definition on WGS 84 ("+proj=utm +zone=33 [+south] +datum=WGS84 …"),
 * or NaN when the string is not such a definition.
 */
export function utmEpsgFromProj4(crs: string): number {
  const isUtm = /\+proj=utm\b/.test(crs);
  const zoneMatch = /\+zone=(\d+)\b/.exec(crs);
  const wgs84 = /\+datum=WGS84\b/.test(crs) || /\+ellps=WGS84\b/.test(crs);
  if (!isUtm || !zoneMatch || !wgs84) return Number.NaN;
  const zone = Number(zoneMatch[1]);
  if (!(zone >= 1 && zone <= UTM_ZONE_COUNT)) return Number.NaN;
  const south = /\+south\b/.test(crs);
  return (south ? EPSG_UTM_SOUTH_BASE : EPSG_UTM_NORTH_BASE) + zone;
}

export interface GeoTiffBand {
  /** Cell values, row-major, row 0 at the north edge, length width·height. */
  data: Float32Array | Uint8Array;
  /** The grid the values belong to. */
  frame: GridFrame;
  /** Nodata value written to GDAL_NODATA: NaN for Float32 (default), a byte value for Uint8. */
  nodata?: number;
  /** Short text stored as GTCitationGeoKey (e.g. "combined Pd, 30 m AGL"). */
  description?: string;
  /** EPSG code of the projected CRS when the frame's proj4 string is not a WGS 84 UTM zone. */
  epsg?: number;
}

// TIFF 6.0 tags (Adobe TIFF 6.0 specification, §8 and appendix A) and GeoTIFF tags (OGC 19-008r4 §7).
const TAG = {
  imageWidth: 256,
  imageLength: 257,
  bitsPerSample: 258,
  compression: 259,
  photometric: 262,
  stripOffsets: 273,
  samplesPerPixel: 277,
  rowsPerStrip: 278,
  stripByteCounts: 279,
  planarConfiguration: 284,
  sampleFormat: 339,
  modelPixelScale: 33550,
  modelTiepoint: 33922,
  geoKeyDirectory: 34735,
  geoAsciiParams: 34737,
  gdalNodata: 42113,
} as const;
/** TIFF field types: SHORT, LONG, DOUBLE, ASCII. */
const TYPE = { ascii: 2, short: 3, long: 4, double: 12 } as const;
const TYPE_BYTES: Record<number, number> = { 2: 1, 3: 2, 4: 4, 12: 8 };
/** GeoKey ids (OGC 19-008r4 tables 4–6). */
const KEY = { modelType: 1024, rasterType: 1025, citation: 1026, projectedCs: 3072 } as const;
const SAMPLE_FORMAT_UINT = 1;
const SAMPLE_FORMAT_FLOAT = 3;
const PHOTOMETRIC_MIN_IS_BLACK = 1;
const TIFF_MAGIC = 42;
const HEADER_BYTES = 8;
const IFD_ENTRY_BYTES = 12;

interface Entry {
  tag: number;
  type: number;
  values: number[] | string;
}

/** True on little-endian hosts (every current browser and Node platform); typed arrays use host order. */
const HOST_LITTLE_ENDIAN = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;

/**
 * Encode one band as a GeoTIFF file: little-endian classic TIFF, uncompressed, one strip, the pixel
 * bytes copied in one block. Throws ExportError without a projected EPSG code or on a size mismatch.
 */
export function encodeGeoTiff(band: GeoTiffBand): ArrayBuffer {
  const { frame, data } = band;
  const { width, height } = frame;
  if (data.length !== width * height) {
    throw new ExportError(
      `raster has ${data.length} values but the grid is ${width} × ${height} = ${width * height}`,
    );
  }
  const epsg = band.epsg ?? utmEpsgFromProj4(frame.crs);
  if (!(Number.isInteger(epsg) && epsg > 0)) {
    throw new ExportError(
      `grid CRS "${frame.crs}" is not a WGS 84 UTM zone and no EPSG code was given; GeoTIFF export needs one`,
    );
  }
  const isFloat = data instanceof Float32Array;
  const nodata = band.nodata ?? (isFloat ? Number.NaN : undefined);
  const citation = `${band.description ?? `WGS 84 / UTM EPSG:${epsg}`}|`;
  const pixelBytes = data.byteLength;
  const entries: Entry[] = [
    { tag: TAG.imageWidth, type: TYPE.long, values: [width] },
    { tag: TAG.imageLength, type: TYPE.long, values: [height] },
    { tag: TAG.bitsPerSample, type: TYPE.short, values: [data.BYTES_PER_ELEMENT * 8] },
    { tag: TAG.compression, type: TYPE.short, values: [1] },
    { tag: TAG.photometric, type: TYPE.short, values: [PHOTOMETRIC_MIN_IS_BLACK] },
    { tag: TAG.stripOffsets, type: TYPE.long, values: [0] },
    { tag: TAG.samplesPerPixel, type: TYPE.short, values: [1] },
    { tag: TAG.rowsPerStrip, type: TYPE.long, values: [height] },
    { tag: TAG.stripByteCounts, type: TYPE.long, values: [pixelBytes] },
    { tag: TAG.planarConfiguration, type: TYPE.short, values: [1] },
    { tag: TAG.sampleFormat, type: TYPE.short, values: [isFloat ? SAMPLE_FORMAT_FLOAT : SAMPLE_FORMAT_UINT] },
    { tag: TAG.modelPixelScale, type: TYPE.double, values: [frame.cellSizeM, frame.cellSizeM, 0] },
    { tag: TAG.modelTiepoint, type: TYPE.double, values: [0, 0, 0, frame.originX, frame.originY, 0] },
    {
      tag: TAG.geoKeyDirectory,
      type: TYPE.short,
      values: [
        1,
        1,
        0,
        4,
        KEY.modelType,
        0,
        1,
        MODEL_TYPE_PROJECTED,
        KEY.rasterType,
        0,
        1,
        RASTER_TYPE_PIXEL_IS_AREA,
        KEY.citation,
        TAG.geoAsciiParams,
        citation.length,
        0,
        KEY.projectedCs,
        0,
        1,
        epsg,
      ],
    },
    { tag: TAG.geoAsciiParams, type: TYPE.ascii, values: `${citation}\0` },
  ];
  if (nodata !== undefined) {
    entries.push({
      tag: TAG.gdalNodata,
      type: TYPE.ascii,
      values: `${Number.isNaN(nodata) ? "nan" : String(nodata)}\0`,
    });
  }
  // Layout: header, IFD, out-of-line values, then the pixels (8-byte aligned).
  const ifdBytes = 2 + entries.length * IFD_ENTRY_BYTES + 4;
  let extra = 0;
  const sizes = entries.map((e) => {
    const n = (typeof e.values === "string" ? e.values.length : e.values.length) * TYPE_BYTES[e.type];
    if (n > 4) extra += n + (n % 2);
    return n;
  });
  const valuesStart = HEADER_BYTES + ifdBytes;
  const pixelsStart = Math.ceil((valuesStart + extra) / 8) * 8;
  (entries.find((e) => e.tag === TAG.stripOffsets)!.values as number[])[0] = pixelsStart;
  const buffer = new ArrayBuffer(pixelsStart + pixelBytes);
  const view = new DataView(buffer);
  const le = true;
  view.setUint16(0, 0x4949, le); // "II": little-endian
  view.setUint16(2, TIFF_MAGIC, le);
  view.setUint32(4, HEADER_BYTES, le);
  view.setUint16(HEADER_BYTES, entries.length, le);
  let next = valuesStart;
  entries.forEach((e, k) => {
    const at = HEADER_BYTES + 2 + k * IFD_ENTRY_BYTES;
    const count = typeof e.values === "string" ? e.values.length : e.values.length;
    view.setUint16(at, e.tag, le);
    view.setUint16(at + 2, e.type, le);
    view.setUint32(at + 4, count, le);
    const inline = sizes[k] <= 4;
    let p = inline ? at + 8 : next;
    if (!inline) {
      view.setUint32(at + 8, next, le);
      next += sizes[k] + (sizes[k] % 2);
    }
    for (let j = 0; j < count; j++) {
      if (typeof e.values === "string") view.setUint8(p++, e.values.charCodeAt(j));
      else if (e.type === TYPE.short) {
        view.setUint16(p, e.values[j], le);
        p += 2;
      } else if (e.type === TYPE.long) {
        view.setUint32(p, e.values[j], le);
        p += 4;
      } else {
        view.setFloat64(p, e.values[j], le);
        p += 8;
      }
    }
  });
  view.setUint32(HEADER_BYTES + 2 + entries.length * IFD_ENTRY_BYTES, 0, le); // no next IFD
  const pixels = new Uint8Array(buffer, pixelsStart, pixelBytes);
  pixels.set(new Uint8Array(data.buffer, data.byteOffset, pixelBytes));
  if (!HOST_LITTLE_ENDIAN && data.BYTES_PER_ELEMENT > 1) {
    for (let i = 0; i < data.length; i++) view.setFloat32(pixelsStart + 4 * i, (data as Float32Array)[i], le);
  }
  return buffer;
}
