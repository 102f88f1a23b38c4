/**
 * `npm run plan -- <subcommand>`: headless runs on plan files with the same engine as the app.
 *   evaluate <plan.json> [--out DIR] [--json] [--mode accurate|fast]
 *   point <plan.json> --at LAT,LON --height-m H [--json]
 *   los --dem FILE (--at LAT,LON | --at-xy X,Y) --mast-m H [--target-m H] [--k K] [--mode M] --out FILE.tif
 * Exit status: 0 done, 1 the run failed (file, terrain, grid), 2 bad input (flag or plan field named).
 */
import { readFileSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import cliProgress from "cli-progress";
import { Command } from "commander";
import { fromArrayBuffer } from "geotiff";
import proj4 from "proj4";
import { DEFAULT_EFFECTIVE_EARTH_FACTOR } from "../coverage/constants.ts";
import { evaluatePoint, evaluateSite, type PreparedSite, type SiteResult } from "../coverage/evaluate.ts";
import type { Grid } from "../coverage/grid.ts";
import {
  computeHorizon,
  lowestVisibleHeightAglM,
  type MaskMode,
  ObserverOutsideGridError,
  visibleMask,
} from "../coverage/terrainMask.ts";
import { crsFromEpsg, readGeoTiffDem } from "../io/demGeotiff.ts";
import { encodeGeoTiff } from "../io/exportGeoTiff.ts";
import { coverageTableLines, metricsDocument } from "../io/exportMetrics.ts";
import { isImportError } from "../io/importErrors.ts";
import type { Plan } from "../io/planSchema.ts";
import { formatPlanErrors, loadPlanFile } from "../io/planValidation.ts";
import { type LoadedDem, PrepareError, preparePlan } from "../io/preparePlan.ts";
import type { SiteGrid } from "../io/siteGrid.ts";
import { exitStatus, parseLatLon, parseNumber, RunError, UsageError } from "./args.ts";
import { ensureOutputDir, readBinaryFile, readTextFile, writeOutputFile } from "./cliFiles.ts";

type Opts = Record<string, string | boolean | undefined>;

/** A failure of the run itself (unreadable file, terrain that does not fit): exit status 1. */
function parseMode(raw: unknown, fallback: MaskMode): MaskMode {
  if (raw === undefined) return fallback;
  if (raw === "accurate" || raw === "fast") return raw;
  throw new UsageError("--mode", `"${String(raw)}" must be accurate or fast`);
}

/** Load and validate a plan file; errors name the file and each field path. */
function loadPlan(planPath: string): Plan {
  const parsed = loadPlanFile(readTextFile("<plan.json>", planPath));
  if (!parsed.ok) {
    throw new UsageError(
      "<plan.json>",
      `${planPath} is not a valid plan:\n${formatPlanErrors(parsed.errors)}`,
    );
  }
  return parsed.plan;
}

/** The plan's DEM file, resolved beside the plan file. */
function loadDem(plan: Plan, planPath: string): LoadedDem | undefined {
  const g = plan.terrain.ground;
  if (g.type !== "dem") return undefined;
  const path = resolve(dirname(planPath), g.file);
  const flag = "terrain.ground.file";
  if (g.kind === "asc") {
    let prjWkt: string | undefined;
    try {
      prjWkt = readFileSync(path.replace(/\.asc$/i, ".prj"), "utf8");
    } catch {
      prjWkt = undefined;
    }
    return { fileName: basename(path), data: readTextFile(flag, path), prjWkt };
  }
  return { fileName: basename(path), data: readBinaryFile(flag, path) };
}

async function prepare(planPath: string): Promise<{ plan: Plan; site: PreparedSite; grid: SiteGrid }> {
  const plan = loadPlan(planPath);
  try {
    const { site, grid } = await preparePlan(plan, loadDem(plan, planPath));
    return { plan, site, grid };
  } catch (e) {
    if (e instanceof PrepareError || isImportError(e) || (e as Error).name === "SiteGridError") {
      throw new RunError(`${planPath}: ${(e as Error).message}`);
    }
    throw e;
  }
}

function safeName(s: string): string {
  return s.replace(/[^A-Za-z0-9._-]+/g, "_");
}

/** Write the per-height rasters of a run into `dir`; returns the file names. */
function writeRasters(dir: string, site: PreparedSite, result: SiteResult): string[] {
  ensureOutputDir("--out", dir);
  const written: string[] = [];
  const put = (name: string, data: Float32Array | Uint8Array, description: string, nodata?: number) => {
    writeOutputFile(
      "--out",
      join(dir, name),
      new Uint8Array(encodeGeoTiff({ data, frame: site.frame, description, nodata })),
    );
    written.push(name);
  };
  for (const t of result.targets) {
    for (const h of t.heights) {
      const tag = `${safeName(t.targetId)}-${h.heightAglM}m`;
      const pd = Float32Array.from(h.combinedPd);
      const overlap = new Float32Array(h.overlapCount.length);
      for (let i = 0; i < pd.length; i++) {
        // Cells that are no valid target position (inside an obstruction, nodata) are nodata.
        if (h.cellState[i] !== 0) {
          pd[i] = Number.NaN;
          overlap[i] = Number.NaN;
        } else overlap[i] = h.overlapCount[i];
      }
      put(`pd-${tag}.tif`, pd, `combined Pd, ${t.name}, ${h.heightAglM} m AGL`);
      put(
        `overlap-${tag}.tif`,
        overlap,
        `radars meeting Pd ${result.requiredPd}, ${t.name}, ${h.heightAglM} m AGL`,
      );
    }
  }
  put(
    "lowest-visible-height.tif",
    result.lowestVisibleHeightAglM,
    "lowest target height above ground seen by at least one radar, m",
  );
  return written;
}

async function evaluateCommand(planPath: string, o: Opts): Promise<void> {
  const { site, grid } = await prepare(planPath);
  const json = o.json === true;
  const mode = parseMode(o.mode, site.maskMode);
  const useBar = !json && process.stderr.isTTY === true;
  const bar = useBar
    ? new cliProgress.SingleBar(
        { format: "  {stage} [{bar}] {value}/{total}", hideCursor: true, stream: process.stderr },
        cliProgress.Presets.shades_classic,
      )
    : null;
  let barStage = "";
  let result: SiteResult;
  try {
    result = await evaluateSite(site, {
      mode,
      onProgress: (p) => {
        if (!bar) return;
        if (p.stage !== barStage) {
          if (barStage !== "") bar.stop();
          barStage = p.stage;
          bar.start(p.total, p.done, { stage: p.stage === "radars" ? "radars" : "fusion" });
        } else bar.update(p.done);
      },
    });
  } catch (e) {
    if (e instanceof ObserverOutsideGridError) throw new RunError(`${planPath}: ${e.message}`);
    throw e;
  } finally {
    bar?.stop();
  }
  const doc = metricsDocument(site, result, grid);
  const lines: string[] = [];
  if (o.out !== undefined) {
    if (typeof o.out !== "string" || o.out === "") throw new UsageError("--out", "a directory is required");
    writeOutputFile(
      "--out",
      join(ensureOutputDir("--out", o.out), "metrics.json"),
      `${JSON.stringify(doc, null, 2)}\n`,
    );
    const files = writeRasters(o.out, site, result);
    lines.push(`wrote ${join(o.out, "metrics.json")} and ${files.length} GeoTIFFs to ${o.out}`);
  }
  if (json) {
    process.stdout.write(`${JSON.stringify(doc, null, 2)}\n`);
    return;
  }
  const out = [
    `${site.name}: ${site.radars.length} radars, grid ${site.frame.width} × ${site.frame.height} at ${site.frame.cellSizeM} m (EPSG:${grid.epsg}), k = ${site.effectiveEarthFactor.toFixed(3)}, ${mode} masking, required Pd ${site.requirement.requiredPd}, Pfa ${site.requirement.pfa}`,
    ...site.warnings.map((w) => `note: ${w}`),
    "",
    ...coverageTableLines(doc),
    "",
    `radars ${result.timingsMs.radars.toFixed(0)} ms, fusion and metrics ${result.timingsMs.fusion.toFixed(0)} ms`,
    ...lines,
  ];
  process.stdout.write(`${out.join("\n")}\n`);
}

async function pointCommand(planPath: string, o: Opts): Promise<void> {
  const at = parseLatLon("--at", o.at);
  const heightAglM = parseNumber("--height-m", o.heightM, { min: 0, max: 10_000, unit: "m" });
  const { site, grid } = await prepare(planPath);
  const [x, y] = grid.toGrid(at.lon, at.lat);
  let res: ReturnType<typeof evaluatePoint>;
  try {
    res = evaluatePoint(site, { x, y }, heightAglM);
  } catch (e) {
    if (e instanceof RangeError)
      throw new UsageError("--at", `${at.lat},${at.lon} lies outside the site grid`);
    throw e;
  }
  if (o.json === true) {
    process.stdout.write(`${JSON.stringify({ lat: at.lat, lon: at.lon, ...res }, null, 2)}\n`);
    return;
  }
  const f1 = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : Number.isNaN(v) ? "–" : v > 0 ? "∞" : "−∞");
  const lines = [
    `${site.name}: point ${at.lat}, ${at.lon} (grid ${x.toFixed(1)} E, ${y.toFixed(1)} N), ${heightAglM} m above ground ${f1(res.groundM)} m ASL` +
      (res.obstructionTopAglM > 0 ? `, under a roof or canopy top of ${f1(res.obstructionTopAglM)} m` : ""),
  ];
  for (const t of site.targets) lines.push(`combined Pd, ${t.name}: ${res.combinedPd[t.id].toFixed(3)}`);
  for (const r of res.rows) {
    const g = r.geometry;
    lines.push(
      "",
      `${r.radarName} [${r.radarId}] → ${r.targetId}: ${r.reasonText}, Pd ${r.pdTable.toFixed(3)} (exact ${r.pdExact.toFixed(3)}), SNR ${f1(r.snrDb)} dB`,
      `  range ${f1(g.slantRangeM)} m, azimuth ${f1(g.azimuthDeg)}°, elevation ${g.elevationDeg.toFixed(2)}°; ${r.visible ? "in sight" : "hidden"}, lowest visible height ${f1(r.lowestVisibleHeightAglM)} m AGL; diffraction ${f1(r.diffractionLossTwoWayDb)} dB two way (v = ${Number.isFinite(r.fresnelV) ? r.fresnelV.toFixed(2) : "none"})`,
    );
    for (const row of r.linkBudget.rows) {
      const sign = row.kind === "result" ? "=" : row.sign > 0 ? "+" : "−";
      lines.push(`    ${sign} ${row.label.padEnd(34)} ${f1(row.valueDb).padStart(8)} ${row.unit}`);
    }
  }
  process.stdout.write(`${lines.join("\n")}\n`);
}

/** The DEM's own grid (north-up, square cells, projected CRS) and its values. */
async function demOnOwnGrid(path: string): Promise<{ grid: Grid; epsg: number }> {
  const buffer = readBinaryFile("--dem", path);
  let image: Awaited<ReturnType<Awaited<ReturnType<typeof fromArrayBuffer>>["getImage"]>>;
  try {
    image = await (await fromArrayBuffer(buffer)).getImage(0);
  } catch (e) {
    throw new UsageError("--dem", `${path} is not a readable GeoTIFF (${(e as Error).message})`);
  }
  const keys = image.getGeoKeys() ?? {};
  const epsg = Number(keys.ProjectedCSTypeGeoKey);
  const crs = Number.isInteger(epsg) ? crsFromEpsg(epsg) : undefined;
  if (crs === undefined || crs.includes("longlat")) {
    throw new UsageError(
      "--dem",
      `${path} must be in a projected CRS in metres with an EPSG code (ProjectedCSTypeGeoKey); los works on the DEM's own grid`,
    );
  }
  const [resX, resY] = image.getResolution();
  if (!(Math.abs(Math.abs(resX) - Math.abs(resY)) < 1e-6 * Math.abs(resX)) || !(resY < 0)) {
    throw new UsageError("--dem", `${path} must be north-up with square cells (has ${resX} × ${resY})`);
  }
  const [originX, originY] = image.getOrigin();
  const frame = {
    width: image.getWidth(),
    height: image.getHeight(),
    originX,
    originY,
    cellSizeM: resX,
    crs,
  };
  try {
    const dem = await readGeoTiffDem(buffer, frame, { fileName: basename(path) });
    return { grid: dem.ground, epsg };
  } catch (e) {
    if (isImportError(e)) throw new UsageError("--dem", (e as Error).message);
    throw e;
  }
}

async function losCommand(o: Opts): Promise<void> {
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
    min: 0,
    minExclusive: true,
    max: 1e6,
  });
  const mode = parseMode(o.mode, "accurate");
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
          data: lowestVisibleHeightAglM(horizon, grid, input),
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

export function buildPlanProgram(): Command {
  const program = new Command("plan")
    .description("Coverage runs on Picket plan files")
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });
  program
    .command("evaluate")
    .description("evaluate a plan: coverage table, metrics JSON and GeoTIFFs")
    .argument("<plan.json>", "plan file")
    .option("--out <dir>", "write metrics.json and per-height GeoTIFFs into this directory")
    .option("--mode <mode>", "masking mode: accurate or fast (default: the plan's)")
    .option("--json", "print the metrics as JSON")
    .action((planPath: string, o: Opts) => evaluateCommand(planPath, o));
  program
    .command("point")
    .description("inspect one position: per radar link budget, visibility, diffraction, Pd")
    .argument("<plan.json>", "plan file")
    .option("--at <lat,lon>", "position, decimal degrees WGS84")
    .option("--height-m <m>", "target height above ground, m")
    .option("--json", "machine-readable output")
    .action((planPath: string, o: Opts) => pointCommand(planPath, o));
  program
    .command("los")
    .description("one observer's visibility raster on a DEM's own grid")
    .option("--dem <file>", "DEM GeoTIFF in a projected CRS")
    .option("--at <lat,lon>", "observer position, decimal degrees WGS84")
    .option("--at-xy <x,y>", "observer position in the DEM's CRS, m")
    .option("--mast-m <m>", "antenna height above ground, m")
    .option("--target-m <m>", "target height above ground, m: output 1 visible / 0 hidden instead of heights")
    .option("--k <k>", "effective-Earth factor (4/3 standard, 1 geometric)")
    .option("--mode <mode>", "masking mode: accurate or fast", "accurate")
    .option("--out <file.tif>", "output GeoTIFF")
    .option("--json", "machine-readable output")
    .action((o: Opts) => losCommand(o));
  return program;
}

/** Run the program; resolves to the exit status (0 ok, 1 run failed, 2 bad input). */
export async function runPlan(argv: string[]): Promise<number> {
  try {
    await buildPlanProgram().parseAsync(argv, { from: "user" });
    return 0;
  } catch (e) {
    return exitStatus("plan", e);
  }
}

if (import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith("plan.ts")) {
  runPlan(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
