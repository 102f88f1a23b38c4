/**
 * GeoTIFF export of site-grid rasters, so GIS tools (QGIS, GDAL) place them where they belong.
 * One band per file, Float32 or Uint8, a north-up grid in a UTM zone on WGS 84.
 * GeoKeys follow the OGC GeoTIFF 1.1 standard (OGC 19-008r4): GTModelTypeGeoKey = 1 (projected),
 * GTRasterTypeGeoKey = 1 (PixelIsArea), ProjectedCSTypeGeoKey = the EPSG code of the UTM zone;
 * ModelTiepointTag ties pixel corner (0, 0) to the grid origin, ModelPixelScaleTag gives the cell size.
 * Nodata is written as the GDAL_NODATA tag (TIFF tag 42113, an ASCII value, "nan" for Float32).
 */
import { writeArrayBuffer } from "geotiff";
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

/** Encode one band as a GeoTIFF file (uncompressed, one strip). Throws ExportError without a projected EPSG code. */
export function encodeGeoTiff(band: GeoTiffBand): ArrayBuffer {
  const { frame, data } = band;
  if (data.length !== frame.width * frame.height) {
    throw new ExportError(
      `raster has ${data.length} values but the grid is ${frame.width} × ${frame.height} = ${frame.width * frame.height}`,
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
  const metadata: Record<string, unknown> = {
    width: frame.width,
    height: frame.height,
    ModelPixelScale: [frame.cellSizeM, frame.cellSizeM, 0],
    ModelTiepoint: [0, 0, 0, frame.originX, frame.originY, 0],
    GTModelTypeGeoKey: MODEL_TYPE_PROJECTED,
    GTRasterTypeGeoKey: RASTER_TYPE_PIXEL_IS_AREA,
    ProjectedCSTypeGeoKey: epsg,
    GTCitationGeoKey: band.description ?? `WGS 84 / UTM EPSG:${epsg}`,
  };
  if (nodata !== undefined) metadata.GDAL_NODATA = Number.isNaN(nodata) ? "nan" : String(nodata);
  return writeArrayBuffer(data, metadata);
}
