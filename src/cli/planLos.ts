/**
 * `plan los`: one observer's raster on a DEM's own grid, for GIS users (lowest visible height above
 * ground, or visible / hidden at one target height). Loaded by plan.ts only when it is run.
 */
import { basename } from "node:path";
import { fromArrayBuffer } from "geotiff";
import proj4 from "proj4";
import {
  DEFAULT_EFFECTIVE_EARTH_FACTOR,
  MAX_EFFECTIVE_EARTH_FACTOR,
  MIN_EFFECTIVE_EARTH_FACTOR,
} from "../coverage/constants.ts";
import type { Grid } from "../coverage/grid.ts";
import { computeHorizon, lowestVisibleHeightAglM, visibleMask } from "../coverage/terrainMask.ts";
import { crsFromEpsg, geoKeysOf, geotransformOf, readGeoTiffDem } from "../io/demGeotiff.ts";
import { encodeGeoTiff } from "../io/exportGeoTiff.ts";
import { errorText, isImportError } from "../io/importErrors.ts";
import { type Opts, parseLatLon, parseMaskMode, parseNumber, UsageError } from "./args.ts";
import { readBinaryFile, writeOutputFile } from "./cliFiles.ts";

/** The DEM's own grid (north-up, square cells, projected CRS) and its values. */
async function demOnOwnGrid(path: string): Promise<{ grid: Grid; epsg: number }> {
  const buffer = readBinaryFile("--dem", path);
  const file = basename(path);
  let image: Awaited<ReturnType<Awaited<ReturnType<typeof fromArrayBuffer>>["getImage"]>>;
  try {
    image = await (await fromArrayBuffer(buffer)).getImage(0);
  } catch (e) {
    throw new UsageError("--dem", `${path} is not a readable GeoTIFF (${errorText(e)})`);
  }
  try {
    const epsg = Number(geoKeysOf(image, file)?.ProjectedCSTypeGeoKey);
    const crs = Number.isInteger(epsg) ? crsFromEpsg(epsg) : undefined;
    if (crs === undefined || crs.includes("longlat")) {
      throw new UsageError(
        "--dem",
        `${path} must be in a projected CRS in metres with an EPSG code (ProjectedCSTypeGeoKey); los works on the DEM's own grid`,
      );
    }
    const gt = geotransformOf(image, file);
    if (!(Math.abs(gt.pixelSizeX - gt.pixelSizeY) < 1e-6 * gt.pixelSizeX)) {
      throw new UsageError(
        "--dem",
        `${path} must have square cells (has ${gt.pixelSizeX} × ${gt.pixelSizeY})`,
      );
    }
    const frame = {
      width: image.getWidth(),
      height: image.getHeight(),
      originX: gt.originX,
      originY: gt.originY,
      cellSizeM: gt.pixelSizeX,
      crs,
    };
    const dem = await readGeoTiffDem(buffer, frame, { fileName: file });
    return { grid: dem.ground, epsg };
  } catch (e) {
    if (isImportError(e)) throw new UsageError("--dem", (e as Error).message);
    throw e;
  }
}

export async function losCommand(o: Opts): Promise<void> {
  if (typeof o.dem !== "string" || o.dem === "") throw new UsageError("--dem", "a DEM GeoTIFF is required");
  if (typeof o.out !== "string" || o.out === "")
    throw new UsageError("--out", "an output .tif file is required");
  if ((o.at === undefined) === (o.atXy === undefined)) {
    throw new UsageError("--at", "give exactly one of --at LAT,LON and --at-xy X,Y");
  }
  const mastM = parseNumber("--mast-m", o.mastM, { min: 0, max: 300, unit: "m" });
  const targetM =
    o.targetM === undefined
      ? undefined
      : parseNumber("--target-m", o.targetM, { min: 0, max: 30_000, unit: "m" });
  const k = parseNumber("--k", o.k ?? String(DEFAULT_EFFECTIVE_EARTH_FACTOR), {
    min: MIN_EFFECTIVE_EARTH_FACTOR,
    max: MAX_EFFECTIVE_EARTH_FACTOR,
  });
  const mode = parseMaskMode(o.mode, "accurate");
  const { grid, epsg } = await demOnOwnGrid(o.dem);
  let x: number;
  let y: number;
  if (o.atXy !== undefined) {
    const parts = String(o.atXy).split(",");
    if (parts.length !== 2) throw new UsageError("--at-xy", `expected X,Y in the DEM's CRS, got "${o.atXy}"`);
    x = parseNumber("--at-xy", parts[0]);
    y = parseNumber("--at-xy", parts[1]);
  } else {
    const at = parseLatLon("--at", o.at);
    [x, y] = proj4("WGS84", grid.crs, [at.lon, at.lat]);
  }
  const flag = o.atXy !== undefined ? "--at-xy" : "--at";
  const col = Math.floor((x - grid.originX) / grid.cellSizeM);
  const row = Math.floor((grid.originY - y) / grid.cellSizeM);
  if (!(col >= 0 && col < grid.width && row >= 0 && row < grid.height)) {
    throw new UsageError(flag, `the observer (${x.toFixed(1)}, ${y.toFixed(1)}) lies outside the DEM`);
  }
  const groundM = grid.data[row * grid.width + col];
  if (Number.isNaN(groundM)) throw new UsageError(flag, "the DEM has no data at the observer");
  const input = {
    surface: grid,
    observerX: x,
    observerY: y,
    antennaHeightAslM: groundM + mastM,
    effectiveEarthFactor: k,
    mode,
  };
  const horizon = computeHorizon(input);
  const bytes =
    targetM === undefined
      ? encodeGeoTiff({
          // Into the horizon's own slope array (each cell reads its slope before its height is written):
          // no second 4 bytes a cell of new memory (about 1 ms per MB to fault in).
          data: lowestVisibleHeightAglM(horizon, grid, input, horizon.horizonSlope),
          frame: grid,
          epsg,
          description: `lowest visible height above ground, m (mast ${mastM} m, k ${k})`,
        })
      : encodeGeoTiff({
          data: maskNodata(visibleMask(horizon, grid, input, targetM), grid.data),
          frame: grid,
          epsg,
          nodata: 255,
          description: `visible (1) / hidden (0) at ${targetM} m above ground (mast ${mastM} m, k ${k})`,
        });
  writeOutputFile("--out", o.out, new Uint8Array(bytes));
  if (o.json === true) process.stdout.write(`${JSON.stringify({ out: o.out, x, y, groundM, mode, k })}\n`);
  else process.stdout.write(`wrote ${o.out} (${grid.width} × ${grid.height}, ${mode} masking, k = ${k})\n`);
}

/** 255 (nodata) where the DEM has none, the visibility elsewhere. */
function maskNodata(vis: Uint8Array, dem: Float32Array): Uint8Array {
  for (let i = 0; i < vis.length; i++) if (Number.isNaN(dem[i])) vis[i] = 255;
  return vis;
}
