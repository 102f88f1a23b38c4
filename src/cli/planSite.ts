/**
 * `plan evaluate` and `plan point`: runs on a plan file (validated, its terrain prepared) with the
 * same engine as the app. Loaded by plan.ts only when one of them is run.
 */
import { readFileSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import cliProgress from "cli-progress";
import { evaluatePoint, evaluateSite, type PreparedSite, type SiteResult } from "../coverage/evaluate.ts";
import { ObserverOutsideGridError } from "../coverage/terrainMask.ts";
import { encodeGeoTiff } from "../io/exportGeoTiff.ts";
import { coverageTableLines, metricsDocument } from "../io/exportMetrics.ts";
import { isImportError } from "../io/importErrors.ts";
import { MAX_TARGET_HEIGHT_M, type Plan } from "../io/planSchema.ts";
import { formatPlanErrors, loadPlanFile } from "../io/planValidation.ts";
import { type LoadedDem, PrepareError, preparePlan } from "../io/preparePlan.ts";
import { type SiteGrid, SiteGridError } from "../io/siteGrid.ts";
import { type Opts, parseLatLon, parseMaskMode, parseNumber, RunError, UsageError } from "./args.ts";
import { ensureOutputDir, readBinaryFile, readTextFile, writeOutputFile } from "./cliFiles.ts";

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
    if (e instanceof SiteGridError) throw new RunError(`${planPath}: ${e.path}: ${e.message}`);
    if (e instanceof PrepareError || isImportError(e))
      throw new RunError(`${planPath}: ${(e as Error).message}`);
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

export async function evaluateCommand(planPath: string, o: Opts): Promise<void> {
  const { site, grid } = await prepare(planPath);
  const json = o.json === true;
  const mode = parseMaskMode(o.mode, site.maskMode);
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

export async function pointCommand(planPath: string, o: Opts): Promise<void> {
  const at = parseLatLon("--at", o.at);
  const heightAglM = parseNumber("--height-m", o.heightM, { min: 0, max: MAX_TARGET_HEIGHT_M, unit: "m" });
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
