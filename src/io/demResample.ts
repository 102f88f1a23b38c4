/**
 * Resampling of a source elevation raster (any CRS proj4 handles) onto the site grid.
 *
 * For each target cell centre: transform (x, y) of the site frame to the source CRS with proj4
 * (exactly, or by linear interpolation along the row where an exact transform at each segment's
 * middle agrees within 0.0001 source pixel), then sample the source bilinearly at that point (pixel centres as nodes). A target centre that
 * falls outside the source's pixel-centre lattice but still within its outer half-pixel rim takes
 * the value at the nearest lattice edge, as a raster covers its full pixel extent. NaN where the
 * point lies outside the source or any of the four neighbouring samples is nodata.
 * A geographic (degrees) source is thus used only through its coordinates: values land on the
 * metric grid, never on degrees. A frame on the source's own lattice (same CRS and cell size,
 * whole-pixel offset; `plan los` on a DEM's own grid) is copied pixel for pixel instead.
 */
import proj4 from "proj4";
import { MAX_ELEVATION_M, MIN_ELEVATION_M } from "../coverage/constants.ts";
import { createGrid, frameOf, type Grid, type GridFrame, sampleBilinear } from "../coverage/grid.ts";
import { ImportError } from "./importErrors.ts";

/** A north-up source raster in its own CRS (degrees or metres), NaN as nodata. */
export interface SourceRaster {
  /** Elevations, m, row-major from the northern row, length width·height; NaN = nodata. */
  data: Float32Array;
  width: number;
  height: number;
  /** x (easting or longitude) of the western edge of column 0, in source CRS units. */
  originX: number;
  /** y (northing or latitude) of the northern edge of row 0, in source CRS units. */
  originY: number;
  /** Pixel width in source CRS units (> 0). */
  pixelSizeX: number;
  /** Pixel height in source CRS units (> 0; rows go south). */
  pixelSizeY: number;
  /** The source CRS as a proj4 string or a registered proj4 name ("EPSG:4326"). */
  crs: string;
}

/** True when a proj4 CRS is geographic (longitude/latitude in degrees). */
export function isGeographicCrs(crs: string): boolean {
  const p = proj4.Proj(crs) as unknown as { projName?: string };
  return p.projName === "longlat";
}

/** Same CRS written the same way: no transform is needed. */
function sameCrs(a: string, b: string): boolean {
  return a.trim() === b.trim();
}

/**
 * Transformer from site-frame x/y (metres) to source CRS coordinates; identity for the same CRS.
 * Throws (from proj4) when either CRS cannot be parsed; callers catch and name the file.
 */
export function frameToSourceTransform(
  frameCrs: string,
  sourceCrs: string,
): (x: number, y: number) => [number, number] {
  if (sameCrs(frameCrs, sourceCrs)) return (x, y) => [x, y];
  const converter = proj4(frameCrs, sourceCrs);
  return (x, y) => {
    const p = converter.forward([x, y]);
    return [p[0], p[1]];
  };
}

/**
 * Source lattice position (fractional column, row; pixel centres at integers) of every cell centre
 * of one frame row. Exact proj4 transforms at every APPROX_STEP_CELLS-th cell and at the row's end;
 * in between, linear interpolation, accepted only where an exact transform at the segment's middle
 * agrees within APPROX_MAX_ERROR_PX (else every cell of the segment is transformed exactly). GDAL's
 * warper interpolates the same way with a default tolerance of 0.125 pixel; this one is far stricter.
 */
function sourcePositionsOfRow(
  frame: GridFrame,
  source: SourceRaster,
  row: number,
  toSource: (x: number, y: number) => [number, number],
  geographic: boolean,
  cols: Float64Array,
  rows: Float64Array,
): void {
  const y = frame.originY - (row + 0.5) * frame.cellSizeM;
  const exact = (col: number) => {
    const p = toSource(frame.originX + (col + 0.5) * frame.cellSizeM, y);
    const sx = geographic ? wrapLongitude(p[0], source.originX) : p[0];
    cols[col] = (sx - source.originX) / source.pixelSizeX - 0.5;
    rows[col] = (source.originY - p[1]) / source.pixelSizeY - 0.5;
  };
  const last = frame.width - 1;
  exact(0);
  for (let a = 0; a < last; ) {
    const b = Math.min(a + APPROX_STEP_CELLS, last);
    exact(b);
    if (b - a >= 2) {
      const m = (a + b) >> 1;
      exact(m);
      const t = (m - a) / (b - a);
      const errC = Math.abs(cols[a] + (cols[b] - cols[a]) * t - cols[m]);
      const errR = Math.abs(rows[a] + (rows[b] - rows[a]) * t - rows[m]);
      if (errC <= APPROX_MAX_ERROR_PX && errR <= APPROX_MAX_ERROR_PX) {
        for (let j = a + 1; j < b; j++) {
          if (j === m) continue;
          const u = (j - a) / (b - a);
          cols[j] = cols[a] + (cols[b] - cols[a]) * u;
          rows[j] = rows[a] + (rows[b] - rows[a]) * u;
        }
      } else {
        for (let j = a + 1; j < b; j++) if (j !== m) exact(j);
      }
    }
    a = b;
  }
}

/** Interpolation step along a row between exact transforms, cells (see sourcePositionsOfRow). */
const APPROX_STEP_CELLS = 16;
/** Largest accepted interpolation error of a source position, source pixels. */
const APPROX_MAX_ERROR_PX = 1e-4;

/**
 * Resample `source` onto `frame` bilinearly (see the file comment).
 * Output: a new Grid of the frame, m; NaN outside the source and next to nodata.
 * The fraction of target cells that received a value is returned beside it.
 */
export function resampleToFrame(
  source: SourceRaster,
  frame: GridFrame,
): { grid: Grid; coveredFraction: number } {
  const offset = latticeOffset(source, frame);
  if (offset !== undefined) return copyAligned(source, frame, offset);
  const grid = createGrid(frame);
  const toSource = frameToSourceTransform(frame.crs, source.crs);
  const geographic = isGeographicCrs(source.crs);
  // sampleBilinear reads only width, height and data: the source lattice in its own pixel units.
  const lattice: Grid = {
    data: source.data,
    width: source.width,
    height: source.height,
    originX: 0,
    originY: 0,
    cellSizeM: 1,
    crs: source.crs,
  };
  const colMax = source.width - 1;
  const rowMax = source.height - 1;
  const out = grid.data;
  const cols = new Float64Array(frame.width);
  const rows = new Float64Array(frame.width);
  let covered = 0;
  for (let row = 0; row < frame.height; row++) {
    sourcePositionsOfRow(frame, source, row, toSource, geographic, cols, rows);
    for (let col = 0; col < frame.width; col++) {
      const c0 = cols[col];
      const r0 = rows[col];
      // Inside the raster's full extent (pixel edges) but beyond the centre lattice: clamp to the edge.
      if (!(c0 >= -0.5 && c0 <= colMax + 0.5 && r0 >= -0.5 && r0 <= rowMax + 0.5)) continue;
      const v = sampleBilinear(lattice, Math.min(colMax, Math.max(0, c0)), Math.min(rowMax, Math.max(0, r0)));
      if (!Number.isNaN(v)) {
        out[row * frame.width + col] = v;
        covered++;
      }
    }
  }
  const total = frame.width * frame.height;
  return { grid, coveredFraction: total > 0 ? covered / total : 0 };
}

/**
 * Whole-pixel offset (columns, rows) of the frame's corner in the source lattice when both share the
 * CRS and the cell size, else undefined. Such a frame is the source grid itself or a window of it.
 */
function latticeOffset(source: SourceRaster, frame: GridFrame): { col: number; row: number } | undefined {
  if (!sameCrs(frame.crs, source.crs)) return undefined;
  const s = frame.cellSizeM;
  const tolerance = 1e-9 * s;
  if (Math.abs(source.pixelSizeX - s) > tolerance || Math.abs(source.pixelSizeY - s) > tolerance)
    return undefined;
  const col = (frame.originX - source.originX) / s;
  const row = (source.originY - frame.originY) / s;
  const c = Math.round(col);
  const r = Math.round(row);
  if (Math.abs(col - c) > 1e-6 || Math.abs(row - r) > 1e-6) return undefined;
  return { col: c, row: r };
}

/**
 * A frame on the source lattice takes each cell's own pixel: bilinear weights there are 1 and 0, and
 * a copy also keeps a cell beside nodata (where 0 × NaN would make it NaN). NaN outside the source.
 */
function copyAligned(
  source: SourceRaster,
  frame: GridFrame,
  offset: { col: number; row: number },
): { grid: Grid; coveredFraction: number } {
  const whole =
    offset.col === 0 && offset.row === 0 && frame.width === source.width && frame.height === source.height;
  // The source grid itself: its array is taken over, not copied.
  const grid = whole ? { ...frameOf(frame), data: source.data } : createGrid(frame);
  const out = grid.data;
  const colFrom = Math.max(0, -offset.col);
  const colTo = Math.min(grid.width, source.width - offset.col);
  let covered = 0;
  if (!whole && colTo > colFrom) {
    for (let row = 0; row < grid.height; row++) {
      const sourceRow = row + offset.row;
      if (sourceRow < 0 || sourceRow >= source.height) continue;
      const from = sourceRow * source.width + offset.col;
      out.set(source.data.subarray(from + colFrom, from + colTo), row * grid.width + colFrom);
    }
  }
  for (let i = 0; i < out.length; i++) if (!Number.isNaN(out[i])) covered++;
  const total = grid.width * grid.height;
  return { grid, coveredFraction: total > 0 ? covered / total : 0 };
}

/** Longitude shifted by whole turns to lie at or east of the raster's western edge (within one turn). */
function wrapLongitude(lonDeg: number, westEdgeDeg: number): number {
  const turnDeg = 360;
  if (!Number.isFinite(lonDeg)) return lonDeg;
  const east = (lonDeg - westEdgeDeg) % turnDeg;
  return westEdgeDeg + (east < 0 ? east + turnDeg : east);
}

/**
 * The bounding box, in source CRS units, of the site frame: its edges densified (the transform
 * bends straight lines), plus the frame's corners. Used to read only the covering DEM window.
 */
export function frameBoundsInCrs(
  frame: GridFrame,
  sourceCrs: string,
): { minX: number; minY: number; maxX: number; maxY: number } {
  const toSource = frameToSourceTransform(frame.crs, sourceCrs);
  const x0 = frame.originX;
  const y0 = frame.originY;
  const x1 = frame.originX + frame.width * frame.cellSizeM;
  const y1 = frame.originY - frame.height * frame.cellSizeM;
  const stepsPerEdge = 32;
  let minX = Number.POSITIVE_INFINITY;
  let minY = Number.POSITIVE_INFINITY;
  let maxX = Number.NEGATIVE_INFINITY;
  let maxY = Number.NEGATIVE_INFINITY;
  const add = (x: number, y: number) => {
    const [sx, sy] = toSource(x, y);
    if (!Number.isFinite(sx) || !Number.isFinite(sy)) return;
    if (sx < minX) minX = sx;
    if (sx > maxX) maxX = sx;
    if (sy < minY) minY = sy;
    if (sy > maxY) maxY = sy;
  };
  for (let i = 0; i <= stepsPerEdge; i++) {
    const t = i / stepsPerEdge;
    add(x0 + (x1 - x0) * t, y0);
    add(x0 + (x1 - x0) * t, y1);
    add(x0, y0 + (y1 - y0) * t);
    add(x1, y0 + (y1 - y0) * t);
  }
  return { minX, minY, maxX, maxY };
}

/** What a DEM holds: bare earth (DTM), the top surface with buildings and canopy (DSM), or not known. */
export type SurfaceKind = "dtm" | "dsm" | "unknown";

/** What a DEM import hands to the engine: ground on the site grid, warnings to show, and provenance. */
export interface DemResult {
  /** Ground elevation on the site grid, m; NaN where the DEM has no data or does not reach. */
  ground: Grid;
  /** Plain-language notes for the user (partial coverage, assumed CRS, reprojection…). */
  warnings: string[];
  source: {
    kind: "geotiff" | "hgt" | "asc" | "flat";
    /** The source CRS as given to proj4 (or the site grid's for flat ground). */
    crs: string;
    /** Bare earth (DTM) or surface (DSM), when known. */
    surfaceKind?: SurfaceKind;
  };
}

/**
 * Resample a decoded source raster to the site frame and state its coverage: a DEM that covers
 * no cell at all is refused (ImportError naming the file), partial coverage is a warning.
 */
export function demResultFromSource(
  source: SourceRaster,
  frame: GridFrame,
  file: string,
  meta: DemResult["source"],
  warnings: string[],
): DemResult {
  dropImplausibleElevations(source.data, file, warnings);
  const { grid, coveredFraction } = resampleToFrame(source, frame);
  if (coveredFraction === 0) {
    throw new ImportError(
      file,
      "the DEM does not cover any cell of the site grid (check the file's area and its CRS)",
    );
  }
  if (coveredFraction < 1) {
    const percent = Math.floor(coveredFraction * 1000) / 10;
    warnings.push(
      `${file}: the DEM covers ${percent} % of the site grid; cells outside it have no ground (nodata, never visible).`,
    );
  }
  return { ground: grid, warnings, source: meta };
}

/**
 * Sets samples outside MIN_ELEVATION_M…MAX_ELEVATION_M (±∞ among them) to NaN, in place, with a
 * warning that counts them and gives one. A source with samples but none plausible is refused: its
 * sample format or vertical unit is wrong, and "covers no cell" would mislead.
 */
function dropImplausibleElevations(data: Float32Array, file: string, warnings: string[]): void {
  // One test per sample on the common path (every DEM import, `plan los` included): counts only
  // what falls outside, the plausible ones follow from them.
  let dropped = 0;
  let nodata = 0;
  let example = 0;
  for (let i = 0; i < data.length; i++) {
    const v = data[i];
    if (v >= MIN_ELEVATION_M && v <= MAX_ELEVATION_M) continue;
    if (Number.isNaN(v)) nodata++;
    else {
      if (dropped === 0) example = v;
      dropped++;
      data[i] = Number.NaN;
    }
  }
  if (dropped === 0) return;
  const kept = data.length - dropped - nodata;
  const range = `${MIN_ELEVATION_M} to ${MAX_ELEVATION_M} m`;
  const eg = Math.abs(example) < 1e6 ? String(Math.round(example)) : example.toExponential(1);
  if (kept === 0) {
    throw new ImportError(
      file,
      `no sample is an elevation on Earth (${range}; e.g. ${eg} m): check the sample format and the vertical unit`,
    );
  }
  warnings.push(`${file}: ${dropped} samples outside ${range} (e.g. ${eg} m) are read as nodata.`);
}

/** Source description of a DEM file the user imported: the surface kind they gave, else "unknown". */
export function importedSourceMeta(
  kind: "asc" | "geotiff",
  crs: string,
  surfaceKind: SurfaceKind | undefined,
): DemResult["source"] {
  return { kind, crs, surfaceKind: surfaceKind ?? "unknown" };
}
