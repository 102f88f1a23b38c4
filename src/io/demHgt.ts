/**
 * SRTM .hgt tile import (also inside a .zip). Format (SRTM Topography documentation, NASA/USGS;
 * common practice): a square of big-endian signed 16-bit elevations in metres, rows from north to
 * south; 3601 × 3601 samples for 1″ tiles, 1201 × 1201 for 3″ tiles; samples lie on whole arc
 * seconds, so the tile's edges are sample centres and neighbouring tiles share their edge rows;
 * −32768 marks a void. The file name gives the south-west corner, e.g. N47E011.hgt covers
 * 47°–48° N, 11°–12° E. Horizontal datum WGS 84, heights above the EGM96 geoid.
 */
import { unzipSync } from "fflate";
import { MAX_ARCHIVE_ENTRY_BYTES } from "../coverage/constants.ts";
import type { GridFrame } from "../coverage/grid.ts";
import { type DemResult, demResultFromSource, type SourceRaster } from "./demResample.ts";
import { ImportError } from "./importErrors.ts";

const HGT_VOID = -32768;
const HGT_SIDE_1_ARCSEC = 3601;
const HGT_SIDE_3_ARCSEC = 1201;
const BYTES_PER_SAMPLE = 2;
const HGT_CRS = "+proj=longlat +datum=WGS84 +no_defs";
// Local file header signature of a zip archive ("PK\x03\x04", APPNOTE 4.3.7).
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];
const DEG_LAT_MAX = 90;
const DEG_LON_MAX = 180;

/** South-west corner of a tile from a name like "N47E011.hgt" (any prefix path, case-insensitive). */
export function hgtTileOrigin(fileName: string): { latDeg: number; lonDeg: number } | undefined {
  const base = fileName.split(/[\\/]/).pop() ?? fileName;
  const m = /([NS])(\d{1,2})([EW])(\d{1,3})/i.exec(base);
  if (!m) return undefined;
  const lat = Number(m[2]) * (m[1].toUpperCase() === "S" ? -1 : 1);
  const lon = Number(m[4]) * (m[3].toUpperCase() === "W" ? -1 : 1);
  if (lat < -DEG_LAT_MAX || lat >= DEG_LAT_MAX || lon < -DEG_LON_MAX || lon >= DEG_LON_MAX) return undefined;
  return { latDeg: lat, lonDeg: lon };
}

/** The .hgt bytes of a buffer that may be a zip archive holding one .hgt entry. */
function hgtBytes(buffer: ArrayBuffer, file: string): { bytes: Uint8Array; name: string } {
  const bytes = new Uint8Array(buffer);
  if (!ZIP_MAGIC.every((b, i) => bytes[i] === b)) return { bytes, name: file };
  let tooBig: string | undefined;
  let entries: Record<string, Uint8Array>;
  try {
    entries = unzipSync(bytes, {
      filter: (f) => {
        if (!/\.hgt$/i.test(f.name)) return false;
        if (f.originalSize > MAX_ARCHIVE_ENTRY_BYTES) {
          tooBig = f.name;
          return false;
        }
        return true;
      },
    });
  } catch (e) {
    throw new ImportError(file, `damaged zip archive (${(e as Error).message})`);
  }
  if (tooBig !== undefined)
    throw new ImportError(file, `${tooBig} unpacks above ${MAX_ARCHIVE_ENTRY_BYTES} bytes`);
  const names = Object.keys(entries);
  if (names.length === 0) throw new ImportError(file, "the archive holds no .hgt file");
  return { bytes: entries[names[0]], name: names[0] };
}

/**
 * Read an SRTM .hgt tile (or a zip holding one) and resample it bilinearly to the site frame.
 * Voids (−32768) become NaN. Throws ImportError naming the file when the size is neither 1″ nor 3″
 * or the name does not give the tile corner.
 */
export function readHgtDem(buffer: ArrayBuffer, fileName: string, frame: GridFrame): DemResult {
  const { bytes, name } = hgtBytes(buffer, fileName);
  const file = name === fileName ? fileName : `${fileName}/${name}`;
  const origin = hgtTileOrigin(name) ?? hgtTileOrigin(fileName);
  if (!origin) {
    throw new ImportError(
      file,
      "the name does not give the tile corner (expected e.g. N47E011.hgt)",
      "fileName",
    );
  }
  let side: number;
  if (bytes.byteLength === HGT_SIDE_1_ARCSEC * HGT_SIDE_1_ARCSEC * BYTES_PER_SAMPLE) side = HGT_SIDE_1_ARCSEC;
  else if (bytes.byteLength === HGT_SIDE_3_ARCSEC * HGT_SIDE_3_ARCSEC * BYTES_PER_SAMPLE)
    side = HGT_SIDE_3_ARCSEC;
  else {
    throw new ImportError(
      file,
      `${bytes.byteLength} bytes is neither a 1″ tile (3601 × 3601 × 2 = ` +
        `${HGT_SIDE_1_ARCSEC * HGT_SIDE_1_ARCSEC * BYTES_PER_SAMPLE} bytes) nor a 3″ tile ` +
        `(1201 × 1201 × 2 = ${HGT_SIDE_3_ARCSEC * HGT_SIDE_3_ARCSEC * BYTES_PER_SAMPLE} bytes)`,
    );
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const cells = side * side;
  const data = new Float32Array(cells);
  let voids = 0;
  for (let i = 0; i < cells; i++) {
    const v = view.getInt16(i * BYTES_PER_SAMPLE, false);
    if (v === HGT_VOID) {
      data[i] = Number.NaN;
      voids++;
    } else data[i] = v;
  }
  const stepDeg = 1 / (side - 1);
  const source: SourceRaster = {
    data,
    width: side,
    height: side,
    // Samples sit on the tile edges: the pixel-edge origin is half a step beyond the corner.
    originX: origin.lonDeg - 0.5 * stepDeg,
    originY: origin.latDeg + 1 + 0.5 * stepDeg,
    pixelSizeX: stepDeg,
    pixelSizeY: stepDeg,
    crs: HGT_CRS,
  };
  const warnings: string[] = [
    `${file}: SRTM heights are above the EGM96 geoid, reprojected bilinearly from geographic degrees to the site grid.`,
  ];
  if (voids > 0) warnings.push(`${file}: ${voids} void samples (−32768) in the tile are nodata.`);
  // SRTM is a C-band radar surface model: it includes part of the canopy and buildings (common practice).
  return demResultFromSource(
    source,
    frame,
    file,
    { kind: "hgt", crs: HGT_CRS, surfaceKind: "dsm" },
    warnings,
  );
}
