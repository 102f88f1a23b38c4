/**
 * Esri ASCII grid (.asc) import. Format (Esri "ESRI ASCII raster format"; common practice):
 * header lines `ncols`, `nrows`, `xllcorner` or `xllcenter`, `yllcorner` or `yllcenter`,
 * `cellsize` (GDAL also writes `dx`/`dy`), optional `NODATA_value`; then nrows × ncols values,
 * row by row from the north. Keys are case-insensitive. The CRS comes from a .prj WKT that the caller
 * passes; without one the site grid's CRS is assumed and a warning says so.
 */
import proj4 from "proj4";
import { MAX_DEM_HEADER_SIDE_CELLS, MAX_DEM_WINDOW_CELLS } from "../coverage/constants.ts";
import type { GridFrame } from "../coverage/grid.ts";
import {
  type DemResult,
  demResultFromSource,
  importedSourceMeta,
  isGeographicCrs,
  type SourceRaster,
  type SurfaceKind,
} from "./demResample.ts";
import { ImportError } from "./importErrors.ts";

const HEADER_KEYS = new Set([
  "ncols",
  "nrows",
  "xllcorner",
  "xllcenter",
  "yllcorner",
  "yllcenter",
  "cellsize",
  "dx",
  "dy",
  "nodata_value",
]);

/** Options for reading an ASCII grid. */
export interface AscDemOptions {
  /** The file name shown in messages (default "DEM ASCII grid"). */
  fileName?: string;
  surfaceKind?: SurfaceKind;
}

function isSpace(code: number): boolean {
  return code === 32 || code === 9 || code === 10 || code === 13;
}

/**
 * Read an Esri ASCII grid and resample it bilinearly to the site frame. `prjWkt` is the content
 * of the companion .prj (WKT), if any. Throws ImportError naming the file and the header key for a
 * missing or invalid key, a size above MAX_DEM_HEADER_SIDE_CELLS per side or MAX_DEM_WINDOW_CELLS
 * in all (checked before any allocation), a value that is not a number, or too few values.
 */
export function readAscDem(
  text: string,
  frame: GridFrame,
  prjWkt?: string,
  options: AscDemOptions = {},
): DemResult {
  const file = options.fileName ?? "DEM ASCII grid";
  const warnings: string[] = [];
  const header = new Map<string, number>();
  let pos = 0;
  const n = text.length;
  let lineNo = 0;
  // Header: lines "key value" while the first token is a known key.
  for (;;) {
    while (pos < n && isSpace(text.charCodeAt(pos))) pos++;
    const lineEnd = text.indexOf("\n", pos);
    const end = lineEnd < 0 ? n : lineEnd;
    const line = text.slice(pos, end).trim();
    const [rawKey, rawValue] = line.split(/\s+/);
    const key = (rawKey ?? "").toLowerCase();
    if (!HEADER_KEYS.has(key)) break;
    lineNo++;
    const value = Number(rawValue);
    if (rawValue === undefined || !Number.isFinite(value)) {
      throw new ImportError(file, `"${rawValue ?? ""}" is not a number (header line ${lineNo})`, rawKey);
    }
    if (header.has(key)) {
      throw new ImportError(file, `given twice (header line ${lineNo}): which one holds is unclear`, rawKey);
    }
    header.set(key, value);
    pos = end;
  }
  const need = (key: string): number => {
    const v = header.get(key);
    if (v === undefined) throw new ImportError(file, "missing header key", key);
    return v;
  };
  const ncols = need("ncols");
  const nrows = need("nrows");
  for (const [key, v] of [
    ["ncols", ncols],
    ["nrows", nrows],
  ] as const) {
    if (!Number.isInteger(v) || v < 1 || v > MAX_DEM_HEADER_SIDE_CELLS) {
      throw new ImportError(file, `${v} must be a whole number from 1 to ${MAX_DEM_HEADER_SIDE_CELLS}`, key);
    }
  }
  if (ncols * nrows > MAX_DEM_WINDOW_CELLS) {
    throw new ImportError(
      file,
      `${ncols} × ${nrows} = ${ncols * nrows} cells is above the ${MAX_DEM_WINDOW_CELLS} an ASCII grid may hold ` +
        "(it is read whole); cut it to the site or convert it to a tiled GeoTIFF",
      nrows > ncols ? "nrows" : "ncols",
    );
  }
  let dx: number;
  let dy: number;
  if (header.has("cellsize")) {
    dx = need("cellsize");
    dy = dx;
  } else if (header.has("dx") && header.has("dy")) {
    dx = need("dx");
    dy = need("dy");
  } else throw new ImportError(file, "missing header key", "cellsize");
  if (!(dx > 0) || !(dy > 0))
    throw new ImportError(file, `${dx} must be above 0`, header.has("cellsize") ? "cellsize" : "dx");
  let west: number;
  if (header.has("xllcorner")) west = need("xllcorner");
  else if (header.has("xllcenter")) west = need("xllcenter") - 0.5 * dx;
  else throw new ImportError(file, "missing header key", "xllcorner");
  let south: number;
  if (header.has("yllcorner")) south = need("yllcorner");
  else if (header.has("yllcenter")) south = need("yllcenter") - 0.5 * dy;
  else throw new ImportError(file, "missing header key", "yllcorner");
  const nodata = header.get("nodata_value");

  let crs: string;
  if (prjWkt !== undefined && prjWkt.trim() !== "") {
    try {
      proj4.Proj(prjWkt);
    } catch (e) {
      throw new ImportError(file, `the .prj WKT is not one proj4 can read (${(e as Error).message})`, "prj");
    }
    crs = prjWkt;
  } else {
    crs = frame.crs;
    warnings.push(`${file}: no .prj given; the grid is assumed to be in the site grid's CRS (${frame.crs}).`);
  }

  // Values: a hand-rolled tokenizer (no split of a large file into a large array of strings).
  const cells = ncols * nrows;
  const data = new Float32Array(cells);
  let count = 0;
  while (count < cells) {
    while (pos < n && isSpace(text.charCodeAt(pos))) pos++;
    if (pos >= n) break;
    const start = pos;
    while (pos < n && !isSpace(text.charCodeAt(pos))) pos++;
    const token = text.slice(start, pos);
    // GDAL writes "nan" for a NaN nodata value in floating-point grids.
    const isNanToken = /^[+-]?nan$/i.test(token);
    const v = isNanToken ? Number.NaN : Number(token);
    if (!isNanToken && !Number.isFinite(v)) {
      const row = Math.floor(count / ncols);
      const col = count % ncols;
      throw new ImportError(
        file,
        `"${token.slice(0, 20)}" is not a number`,
        `row ${row + 1}, column ${col + 1}`,
      );
    }
    data[count++] = v === nodata ? Number.NaN : v;
  }
  if (count < cells) {
    throw new ImportError(
      file,
      `the header promises ${ncols} × ${nrows} = ${cells} values but the file holds ${count}`,
    );
  }
  while (pos < n && isSpace(text.charCodeAt(pos))) pos++;
  if (pos < n) warnings.push(`${file}: text after the ${cells} values is ignored.`);

  const source: SourceRaster = {
    data,
    width: ncols,
    height: nrows,
    originX: west,
    originY: south + nrows * dy,
    pixelSizeX: dx,
    pixelSizeY: dy,
    crs,
  };
  if (isGeographicCrs(crs))
    warnings.push(`${file}: geographic grid (degrees) reprojected bilinearly to the site grid.`);
  return demResultFromSource(
    source,
    frame,
    file,
    importedSourceMeta("asc", crs, options.surfaceKind),
    warnings,
  );
}
