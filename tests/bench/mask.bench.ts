/**
 * Benchmark of the masking sweeps on deterministic synthetic DEMs of 1, 4 and 16 M cells (rough terrain
 * with buildings, 10 m cells), single-threaded: median and spread (min–max) of wall time per mode, in
 * M cells/s, and — when Debian's python3-gdal and gdal-bin are installed — GDAL 3.6's in-process viewshed
 * (MEM datasets, tests/bench/gdal_viewshed_timer.py) on the same DEM and observer, interleaved round by
 * round, plus `gdal_viewshed -om GROUND` end to end, with the ratios. Timings are printed, never asserted.
 * Run alone with `npx tsx tests/bench/mask.bench.ts [sizes…]`, or through `npm run bench`.
 */
import { type ChildProcessWithoutNullStreams, spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface, type Interface } from "node:readline";
import { fileURLToPath } from "node:url";
import { DEFAULT_EFFECTIVE_EARTH_FACTOR, EARTH_RADIUS_M } from "../../src/coverage/constants.ts";
import {
  computeHorizon,
  lowestVisibleHeightAglM,
  type MaskInput,
  type MaskMode,
} from "../../src/coverage/terrainMask.ts";
import { syntheticDem } from "../fixtures/viewshed/syntheticDem.ts";

const CELL_M = 10;
const MAST_M = 15;
/** GDAL lowers by cc·d²/(2·a_WGS84); Picket by d²/(2·k·a): cc = a_WGS84/(k·a) (see gen_viewshed.py). */
const WGS84_SEMI_MAJOR_M = 6_378_137;
const GDAL_CC = WGS84_SEMI_MAJOR_M / (DEFAULT_EFFECTIVE_EARTH_FACTOR * EARTH_RADIUS_M);
const PYTHON = "/usr/bin/python3";
const TIMER = fileURLToPath(new URL("./gdal_viewshed_timer.py", import.meta.url));

interface Stats {
  median: number;
  min: number;
  max: number;
}

function stats(xs: number[]): Stats {
  const s = [...xs].sort((a, b) => a - b);
  return { median: s[Math.floor(s.length / 2)], min: s[0], max: s[s.length - 1] };
}

function fmtMs(s: Stats): string {
  return `${s.median.toFixed(1)} ms (${s.min.toFixed(1)}–${s.max.toFixed(1)})`;
}

function mcps(cells: number, ms: number): string {
  return `${(cells / ms / 1e3).toFixed(1)} M cells/s`;
}

/**
 * CPU time of a thread so far, ms, from Linux's /proc/…/schedstat (first field: ns on a CPU); NaN
 * elsewhere. On a shared machine the wall time includes waiting for a core, the CPU time does not.
 */
function cpuMs(path: string): number {
  try {
    return Number(readFileSync(path, "utf8").split(" ")[0]) / 1e6;
  } catch {
    return Number.NaN;
  }
}

/**
 * CPU time of this process so far, ms. Not the running thread's own schedstat: that figure is brought up to
 * date only at scheduler events, and against the wall time of a busy loop it lagged by 0–8 ms here, most of
 * a 1 M-cell sweep; getrusage (process.cpuUsage) updates the caller's run time first (within 0.1 ms of the
 * wall time when not descheduled). It also counts V8's helper threads (GC, compiler). GDAL's child is read
 * from schedstat while it sleeps on its input, when that figure is up to date.
 */
function selfCpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e3;
}

/** A long-lived python3-gdal child answering one JSON line per command. */
class GdalTimer {
  private readonly child: ChildProcessWithoutNullStreams;
  private readonly lines: Interface;
  private readonly pending: ((line: string) => void)[] = [];

  constructor() {
    this.child = spawn(PYTHON, [TIMER], { stdio: ["pipe", "pipe", "pipe"] });
    this.lines = createInterface({ input: this.child.stdout });
    this.lines.on("line", (l) => this.pending.shift()?.(l));
    this.child.stderr.on("data", (d) => process.stderr.write(d));
    this.child.on("error", (e) => {
      for (const p of this.pending.splice(0)) p(JSON.stringify({ error: String(e) }));
    });
  }

  ask(msg: object): Promise<Record<string, unknown>> {
    return new Promise((resolve) => {
      this.pending.push((l) => resolve(JSON.parse(l)));
      this.child.stdin.write(`${JSON.stringify(msg)}\n`);
    });
  }

  /** CPU time of the child's main thread so far, ms (NaN when unknown). */
  cpuMs(): number {
    return this.child.pid === undefined ? Number.NaN : cpuMs(`/proc/${this.child.pid}/schedstat`);
  }

  async close(): Promise<void> {
    this.child.stdin.write(`${JSON.stringify({ cmd: "quit" })}\n`);
    await new Promise((r) => this.child.once("exit", r));
  }
}

function gdalAvailable(): boolean {
  if (!existsSync(PYTHON)) return false;
  const r = spawnSync(PYTHON, ["-c", "from osgeo import gdal"], { stdio: "ignore" });
  // gdal_viewshed --version prints the version and then its usage (exit 1): look for the version line.
  const cli = spawnSync("gdal_viewshed", ["--version"], { encoding: "utf8" });
  return r.status === 0 && /GDAL \d/.test(cli.stdout ?? "");
}

async function benchSize(side: number, rounds: number, gdal: GdalTimer | null, dir: string): Promise<void> {
  const cells = side * side;
  const tGen = performance.now();
  const dem = syntheticDem({ width: side, height: side, cellSizeM: CELL_M, seed: 2026, ridgeM: 60 });
  const genMs = performance.now() - tGen;
  const col = Math.floor(side * 0.45);
  const row = Math.floor(side * 0.55);
  const s = dem.surface;
  const observerX = s.originX + (col + 0.5) * CELL_M;
  const observerY = s.originY - (row + 0.5) * CELL_M;
  const base: Omit<MaskInput, "mode"> = {
    surface: s,
    observerX,
    observerY,
    antennaHeightAslM: s.data[row * side + col] + MAST_M,
    effectiveEarthFactor: DEFAULT_EFFECTIVE_EARTH_FACTOR,
  };
  const tif = join(dir, `dem_${side}.tif`);
  const gdalOut = join(dir, `lvh_${side}.tif`);
  if (gdal) {
    const raw = join(dir, `dem_${side}.f32`);
    writeFileSync(raw, new Uint8Array(s.data.buffer, s.data.byteOffset, s.data.byteLength));
    await gdal.ask({
      cmd: "load",
      raw,
      width: side,
      height: side,
      originX: s.originX,
      originY: s.originY,
      cellSizeM: CELL_M,
      tif,
    });
  }
  // Warm-up (JIT) on this size.
  for (const mode of ["fast", "accurate"] as MaskMode[]) computeHorizon({ ...base, mode });
  const t: Record<string, number[]> = {
    fast: [],
    accurate: [],
    lvh: [],
    fastReuse: [],
    accurateReuse: [],
    fastDist: [],
    accurateDist: [],
    gdalMem: [],
    gdalCli: [],
    cpuFast: [],
    cpuAccurate: [],
    cpuFastReuse: [],
    cpuAccurateReuse: [],
    cpuGdalMem: [],
  };
  const lvhOut = new Float32Array(cells);
  const reuse = computeHorizon({ ...base, mode: "fast" });
  for (let r = 0; r < rounds; r++) {
    for (const mode of ["fast", "accurate"] as MaskMode[]) {
      const c0 = selfCpuMs();
      const t0 = performance.now();
      computeHorizon({ ...base, mode }, reuse);
      t[`${mode}Reuse`].push(performance.now() - t0);
      t[mode === "fast" ? "cpuFastReuse" : "cpuAccurateReuse"].push(selfCpuMs() - c0);
    }
    for (const mode of ["fast", "accurate"] as MaskMode[]) {
      const c0 = selfCpuMs();
      const t0 = performance.now();
      const h = computeHorizon({ ...base, mode });
      const t1 = performance.now();
      t[mode === "fast" ? "cpuFast" : "cpuAccurate"].push(selfCpuMs() - c0);
      t[mode].push(t1 - t0);
      if (mode === "accurate") {
        lowestVisibleHeightAglM(h, dem.ground, { ...base, mode }, lvhOut);
        t.lvh.push(performance.now() - t0);
      }
    }
    // distanceM is filled on first read: the sweep plus that read is what a caller of distanceM pays.
    for (const mode of ["fast", "accurate"] as MaskMode[]) {
      const t0 = performance.now();
      const h = computeHorizon({ ...base, mode });
      if (h.distanceM.length !== cells) throw new Error("distanceM has the wrong size");
      t[`${mode}Dist`].push(performance.now() - t0);
    }
    if (gdal) {
      const g0 = gdal.cpuMs();
      const res = await gdal.ask({
        cmd: "viewshed",
        observerX,
        observerY,
        observerHeightM: MAST_M,
        cc: GDAL_CC,
        mode: "normal",
      });
      t.gdalMem.push(Number(res.seconds) * 1000);
      // The child waits on its input otherwise: its CPU time across the request is the call's (and the
      // few microseconds of reading one JSON line).
      t.cpuGdalMem.push(gdal.cpuMs() - g0);
      const t0 = performance.now();
      const cli = spawnSync(
        "gdal_viewshed",
        [
          "-q",
          "-om",
          "GROUND",
          "-ox",
          String(observerX),
          "-oy",
          String(observerY),
          "-oz",
          String(MAST_M),
        ].concat(["-cc", String(GDAL_CC), tif, gdalOut]),
        { stdio: "ignore" },
      );
      if (cli.status === 0) t.gdalCli.push(performance.now() - t0);
    }
  }
  const fast = stats(t.fast);
  const acc = stats(t.accurate);
  const lines = [
    `masking ${side}×${side} = ${(cells / 1e6).toFixed(1)} M cells (DEM generated in ${genMs.toFixed(0)} ms), ${rounds} rounds, single thread:`,
    `  fast      ${fmtMs(fast)}  → ${mcps(cells, fast.median)}`,
    `  accurate  ${fmtMs(acc)}  → ${mcps(cells, acc.median)}`,
    `  accurate + lowest visible height ${fmtMs(stats(t.lvh))}`,
    `  into reused arrays: fast ${fmtMs(stats(t.fastReuse))} → ${mcps(cells, stats(t.fastReuse).median)}, ` +
      `accurate ${fmtMs(stats(t.accurateReuse))} → ${mcps(cells, stats(t.accurateReuse).median)}`,
    `  with distanceM read: fast ${fmtMs(stats(t.fastDist))} → ${mcps(cells, stats(t.fastDist).median)}, ` +
      `accurate ${fmtMs(stats(t.accurateDist))} → ${mcps(cells, stats(t.accurateDist).median)}`,
  ];
  if (gdal && t.gdalMem.length > 0) {
    const g = stats(t.gdalMem);
    const fr = stats(t.fastReuse);
    const ar = stats(t.accurateReuse);
    lines.push(`  GDAL ViewshedGenerate (MEM, in-process) ${fmtMs(g)}  → ${mcps(cells, g.median)}`);
    lines.push(
      `  speed ratio to GDAL in-process (>1 = faster): fast ${(g.median / fast.median).toFixed(2)}×, accurate ${(g.median / acc.median).toFixed(2)}×; ` +
        `reused arrays: fast ${(g.median / fr.median).toFixed(2)}×, accurate ${(g.median / ar.median).toFixed(2)}×`,
    );
  }
  if (!Number.isNaN(stats(t.cpuFast).median)) {
    const cf = stats(t.cpuFast);
    const ca = stats(t.cpuAccurate);
    const cfr = stats(t.cpuFastReuse);
    const car = stats(t.cpuAccurateReuse);
    lines.push(
      `  CPU time (no waiting for a core): fast ${fmtMs(cf)} → ${mcps(cells, cf.median)}, ` +
        `reused ${fmtMs(cfr)} → ${mcps(cells, cfr.median)}; accurate ${fmtMs(ca)} → ${mcps(cells, ca.median)}, ` +
        `reused ${fmtMs(car)} → ${mcps(cells, car.median)}`,
    );
    if (t.cpuGdalMem.length > 0 && !Number.isNaN(stats(t.cpuGdalMem).median)) {
      const cg = stats(t.cpuGdalMem);
      lines.push(
        `  CPU time GDAL in-process ${fmtMs(cg)} → ${mcps(cells, cg.median)}; ratio (>1 = faster): ` +
          `fast ${(cg.median / cf.median).toFixed(2)}× (reused ${(cg.median / cfr.median).toFixed(2)}×), ` +
          `accurate ${(cg.median / ca.median).toFixed(2)}× (reused ${(cg.median / car.median).toFixed(2)}×)`,
      );
    }
  }
  if (t.gdalCli.length > 0) {
    const c = stats(t.gdalCli);
    const l = stats(t.lvh);
    lines.push(`  gdal_viewshed -om GROUND end to end (GeoTIFF in and out) ${fmtMs(c)}`);
    lines.push(
      `  ratio gdal_viewshed CLI / (accurate sweep + lowest visible height, in-process): ${(c.median / l.median).toFixed(2)}×`,
    );
  }
  console.log(lines.join("\n"));
}

/** Times both masking modes (and GDAL when installed) on 1, 4 and 16 M cells; prints, never asserts. */
export async function run(sides: number[] = [1024, 2048, 4096]): Promise<void> {
  const gdal = gdalAvailable() ? new GdalTimer() : null;
  if (!gdal) console.log("masking: python3-gdal / gdal_viewshed not found, GDAL comparison skipped");
  const dir = mkdtempSync(join(tmpdir(), "picket-mask-bench-"));
  try {
    for (const side of sides) await benchSize(side, side >= 4096 ? 5 : side >= 2048 ? 7 : 9, gdal, dir);
  } finally {
    await gdal?.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1]?.endsWith("mask.bench.ts")) {
  const sides = process.argv
    .slice(2)
    .map(Number)
    .filter((n) => n > 0);
  await run(sides.length > 0 ? sides : undefined);
}
