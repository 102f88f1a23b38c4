/**
 * `plan los` end to end (process start, GeoTIFF in and out) against `gdal_viewshed -om GROUND` on the
 * same 4.2 M-cell DEM and observer, interleaved round by round: the installed entry `picket-plan`
 * (node src/cli/plan-bin.mjs, from its bundle) in accurate and fast mode, `npm run plan` once per
 * round, and the in-process call (no start-up). Medians and spreads printed, never asserted.
 * Run alone with `npx tsx tests/bench/los.bench.ts`.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { runPlan } from "../../src/cli/plan.ts";
import { encodeGeoTiff } from "../../src/io/exportGeoTiff.ts";
import { syntheticDem } from "../fixtures/viewshed/syntheticDem.ts";
import { msText, spread } from "./stats.ts";

const SIDE = 2048;

/** Wall time of a command, ms; throws when it fails (a failed run must not pass for a fast one). */
function timeCommand(cmd: string, args: string[]): number {
  const t = performance.now();
  const r = spawnSync(cmd, args, { stdio: ["ignore", "ignore", "pipe"], encoding: "utf8" });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed: ${r.stderr}`);
  return performance.now() - t;
}

export async function run(rounds = 7): Promise<void> {
  const haveGdal = spawnSync("gdal_viewshed", [], { stdio: "ignore" }).error === undefined;
  const dem = syntheticDem({ width: SIDE, height: SIDE, cellSizeM: 10, seed: 7, buildings: 400 });
  const dir = mkdtempSync(join(tmpdir(), "picket-los-bench-"));
  try {
    const demPath = join(dir, "dem.tif");
    const frame = {
      ...dem.surface,
      originX: 500_000,
      originY: 4_600_000,
      crs: "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs",
    };
    writeFileSync(demPath, new Uint8Array(encodeGeoTiff({ data: dem.surface.data, frame })));
    const x = frame.originX + 0.45 * SIDE * 10 + 5;
    const y = frame.originY - 0.55 * SIDE * 10 - 5;
    const los = [
      "los",
      "--dem",
      demPath,
      "--at-xy",
      `${x},${y}`,
      "--mast-m",
      "15",
      "--out",
      join(dir, "los.tif"),
    ];
    // GDAL's curvature coefficient for k = 4/3 (as in mask.bench.ts): cc = a_WGS84 / (k · a).
    const cc = String(6_378_137 / ((4 / 3) * 6_371_000));
    const gdalArgs = ["-q", "-om", "GROUND", "-oz", "15", "-ox", String(x), "-oy", String(y), "-cc", cc];
    const times: Record<string, number[]> = { accurate: [], fast: [], npmRun: [], inProcess: [], gdal: [] };
    timeCommand(process.execPath, ["src/cli/plan-bin.mjs", ...los]); // builds the bundle if stale
    await runPlan(los); // warm-up of the in-process path
    for (let r = 0; r < rounds; r++) {
      times.accurate.push(timeCommand(process.execPath, ["src/cli/plan-bin.mjs", ...los]));
      times.fast.push(timeCommand(process.execPath, ["src/cli/plan-bin.mjs", ...los, "--mode", "fast"]));
      times.npmRun.push(timeCommand("npm", ["run", "-s", "plan", "--", ...los]));
      const t = performance.now();
      await runPlan(los);
      times.inProcess.push(performance.now() - t);
      if (haveGdal)
        times.gdal.push(timeCommand("gdal_viewshed", [...gdalArgs, demPath, join(dir, "gdal.tif")]));
    }
    const lines = [
      `plan los on ${SIDE * SIDE} cells, ${rounds} rounds, load average ${loadavg()[0].toFixed(1)}:`,
      `  picket-plan (bundle), accurate ${msText(times.accurate)}; fast ${msText(times.fast)}`,
      `  npm run plan, accurate ${msText(times.npmRun)}; in-process, accurate ${msText(times.inProcess)}`,
    ];
    if (haveGdal) {
      const ratio = (ours: number[]) => (spread(times.gdal).median / spread(ours).median).toFixed(2);
      lines.push(
        `  gdal_viewshed -om GROUND ${msText(times.gdal)}; ratio gdal/ours: picket-plan accurate ` +
          `${ratio(times.accurate)}, fast ${ratio(times.fast)}, npm run ${ratio(times.npmRun)}, ` +
          `in-process ${ratio(times.inProcess)}`,
      );
    } else lines.push("  gdal_viewshed not installed (apt-get install gdal-bin): comparison skipped");
    console.log(lines.join("\n"));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1]?.endsWith("los.bench.ts")) await run();
