/**
 * Coverage benchmark: the radar stage (SNR + Pd + reason for 4 heights, horizon given) in ns per cell,
 * and the full evaluation of a 10-radar, 3-height plan on 4 M cells (2048 × 2048 at 5 m, rough terrain
 * with buildings), single-threaded and on 2 Node worker_threads via comlink. Medians and spreads
 * (min–max) are printed, never asserted. `plan los` against `gdal_viewshed` is in los.bench.ts.
 * Run alone with `npx tsx tests/bench/coverage.bench.ts [stage|breakdown|full|shared]`.
 */
import { Worker } from "node:worker_threads";
import * as Comlink from "comlink";
import nodeEndpoint from "comlink/dist/esm/node-adapter.mjs";
import {
  buildRadarKernel,
  type PlacedRadar,
  type RadarCoverage,
  radarCoverageFromHorizon,
} from "../../src/coverage/coverage.ts";
import {
  evaluateSite,
  type FusionJob,
  type FusionRunner,
  type PreparedSite,
  type RadarRunner,
} from "../../src/coverage/evaluate.ts";
import type { FusedHeight } from "../../src/coverage/fusion.ts";
import type { HeightMetrics } from "../../src/coverage/metrics.ts";
import type { RadarModel } from "../../src/coverage/radarModel.ts";
import { computeHorizon, type MaskMode } from "../../src/coverage/terrainMask.ts";
import { demoRadar } from "../unit/coverageFixtures.ts";
import { type CoverageWorkerApi, resultBuffers } from "./coverageWorkerApi.ts";
import { radarAt, SIDE, siteOn, stageTimes } from "./stageSite.ts";

function stats(xs: number[]): { median: number; min: number; max: number } {
  const s = [...xs].sort((a, b) => a - b);
  return { median: s[Math.floor(s.length / 2)], min: s[0], max: s[s.length - 1] };
}

function fmt(x: { median: number; min: number; max: number }, digits = 1): string {
  return `median ${x.median.toFixed(digits)} (min ${x.min.toFixed(digits)}, max ${x.max.toFixed(digits)})`;
}

/** Radar stage alone: ns per cell for 4 heights, one class, every cell within range. */
export function benchStage(label: string, model: RadarModel, cellSizeM: number, runs: number): void {
  const { fresh, reused, cells } = stageTimes(model, cellSizeM, runs);
  console.log(
    `coverage radar stage, ${label}, ${cells} cells × 4 heights: new outputs ${fmt(stats(fresh))} ns/cell; ` +
      `outputs reused ${fmt(stats(reused))} ns/cell; ${runs} runs each`,
  );
}

export function planRadars(s: { frame: PreparedSite["frame"]; ground: Float32Array }): PlacedRadar[] {
  const kalvori = demoRadar("kalvori-x9");
  const mossbee = demoRadar("mossbee-58");
  const zorvane = demoRadar("zorvane-s24");
  const c = SIDE / 2;
  const q = SIDE / 4;
  return [
    radarAt(s, kalvori, c - q, c - q, 0, "k1"),
    radarAt(s, kalvori, c + q, c + q, 0, "k2"),
    radarAt(s, kalvori, c + q, c - q, 0, "k3"),
    radarAt(s, mossbee, c - 40, c, 270, "m1"),
    radarAt(s, mossbee, c + 40, c, 90, "m2"),
    radarAt(s, mossbee, c, c - 40, 0, "m3"),
    radarAt(s, mossbee, c, c + 40, 180, "m4"),
    radarAt(s, zorvane, c - 100, c - 100, 315, "z1"),
    radarAt(s, zorvane, c + 100, c + 100, 135, "z2"),
    radarAt(s, zorvane, c - 100, c + 100, 225, "z3"),
  ];
}

/** A runner that sends each radar to the next free worker. */
function workerRunner(apis: Comlink.Remote<CoverageWorkerApi>[]): RadarRunner {
  const free = [...apis];
  const waiting: ((w: Comlink.Remote<CoverageWorkerApi>) => void)[] = [];
  const take = (): Promise<Comlink.Remote<CoverageWorkerApi>> =>
    free.length > 0 ? Promise.resolve(free.pop()!) : new Promise((res) => waiting.push(res));
  const give = (w: Comlink.Remote<CoverageWorkerApi>) => {
    const next = waiting.shift();
    if (next) next(w);
    else free.push(w);
  };
  return async (_site, index, mode: MaskMode, reuse?: RadarCoverage): Promise<RadarCoverage> => {
    const w = await take();
    try {
      const sent = reuse ? Comlink.transfer(reuse, resultBuffers(reuse)) : undefined;
      return (await w.computeRadar(index, mode, sent)) as RadarCoverage;
    } finally {
      give(w);
    }
  };
}

async function benchFull(runs: number): Promise<void> {
  const site = siteOn(5, planRadars, [10, 30, 60]);
  const n = SIDE * SIDE;
  await evaluateSite(site); // warm-up (JIT, Pd tables)
  const single: number[] = [];
  const radarsMs: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t = performance.now();
    const res = await evaluateSite(site);
    single.push(performance.now() - t);
    radarsMs.push(res.timingsMs.radars);
  }
  console.log(
    `coverage full evaluation, 10 radars × 3 heights on ${n} cells, 1 thread: ${fmt(stats(single), 0)} ms ` +
      `(radar stages ${fmt(stats(radarsMs), 0)} ms), ${runs} runs`,
  );
  // The same, each run writing into the previous run's radar arrays (how the app re-evaluates).
  let previous = await evaluateSite(site);
  const singleReuse: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t = performance.now();
    previous = await evaluateSite(site, { previous });
    singleReuse.push(performance.now() - t);
  }
  console.log(
    `coverage full evaluation, 1 thread, previous result's arrays reused: ${fmt(stats(singleReuse), 0)} ms`,
  );

  const workers = [0, 1].map(() => new Worker(new URL("./coverageWorker.mjs", import.meta.url)));
  const apis = workers.map((w) => Comlink.wrap<CoverageWorkerApi>(nodeEndpoint(w)));
  try {
    const tu = performance.now();
    await Promise.all(apis.map((a) => a.setSite(site)));
    const uploadMs = performance.now() - tu;
    const runRadar = workerRunner(apis);
    await evaluateSite(site, { runRadar }); // warm-up in the workers
    const two: number[] = [];
    for (let r = 0; r < runs; r++) {
      const t = performance.now();
      await evaluateSite(site, { runRadar });
      two.push(performance.now() - t);
    }
    const s2 = stats(two);
    console.log(
      `coverage full evaluation, 2 workers (site posted once, ${uploadMs.toFixed(0)} ms): ${fmt(s2, 0)} ms; ` +
        `speed-up ${(stats(single).median / s2.median).toFixed(2)} × over 1 thread`,
    );
    let prev2 = await evaluateSite(site, { runRadar });
    const twoReuse: number[] = [];
    for (let r = 0; r < runs; r++) {
      const t = performance.now();
      prev2 = await evaluateSite(site, { runRadar, previous: prev2 });
      twoReuse.push(performance.now() - t);
    }
    const s2r = stats(twoReuse);
    console.log(
      `coverage full evaluation, 2 workers, previous result's arrays sent back and reused: ${fmt(s2r, 0)} ms; ` +
        `speed-up ${(stats(singleReuse).median / s2r.median).toFixed(2)} × over 1 thread reusing`,
    );
    // Radar stages alone, each worker writing into its previous result buffers (no allocation, no
    // transfer): the compute scaling of 1 against 2 workers.
    const indices = site.radars.map((_, i) => i);
    const inPlace = async (k: number) => {
      const t = performance.now();
      let next = 0;
      await Promise.all(
        apis.slice(0, k).map(async (a) => {
          while (next < indices.length) await a.computeRadarInPlace(indices[next++], "accurate");
        }),
      );
      return performance.now() - t;
    };
    await inPlace(2); // allocate and warm the kept buffers
    const one: number[] = [];
    const both: number[] = [];
    for (let r = 0; r < runs; r++) {
      one.push(await inPlace(1));
      both.push(await inPlace(2));
    }
    const o1 = stats(one);
    const o2 = stats(both);
    console.log(
      `coverage 10 radar stages into reused buffers: 1 worker ${fmt(o1, 0)} ms, 2 workers ${fmt(o2, 0)} ms; ` +
        `speed-up ${(o1.median / o2.median).toFixed(2)} ×`,
    );
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  await benchShared(site, runs, stats(singleReuse).median);
}

/** The shared-memory worker API of coverageWorker.mjs (workerData { shared: true }). */
interface SharedWorkerApi {
  setSite(s: PreparedSite): void;
  setOutputs(index: number, coverage: RadarCoverage): void;
  compute(index: number, mode: MaskMode): RadarCoverage["extent"];
  setFusionOutputs(key: string, out: { fused: FusedHeight; cellState: Uint8Array }): void;
  fuse(job: FusionJob): HeightMetrics;
}

/** A RadarCoverage of the site's shape whose arrays are views on new SharedArrayBuffers. */
function sharedCoverage(site: PreparedSite, radarId: string): RadarCoverage {
  const n = site.frame.width * site.frame.height;
  const f32 = () => new Float32Array(new SharedArrayBuffer(4 * n));
  return {
    radarId,
    heightsAglM: [...site.heightsAglM],
    targetIds: site.targets.map((t) => t.id),
    lowestVisibleHeightAglM: f32(),
    heights: site.heightsAglM.map((h) => ({
      heightAglM: h,
      snrDbAt0Dbsm: f32(),
      targets: site.targets.map((t) =>
        t.heightsAglM.includes(h)
          ? { pd: f32(), reason: new Uint8Array(new SharedArrayBuffer(n)) }
          : { pd: null, reason: null },
      ),
    })),
  };
}

/**
 * Full evaluation with the radar results in shared memory: allocated once, posted once to both
 * workers, each radar computed in place by the next free worker (heaviest first, as evaluateSite
 * starts them in site order), fusion and metrics on the main thread into the previous result.
 */
async function benchShared(site: PreparedSite, runs: number, singleReuseMs: number): Promise<void> {
  const workers = [0, 1].map(
    () => new Worker(new URL("./coverageWorker.mjs", import.meta.url), { workerData: { shared: true } }),
  );
  const apis = workers.map((w) => Comlink.wrap<SharedWorkerApi>(nodeEndpoint(w)));
  try {
    const reference = await evaluateSite(site);
    const outputs = site.radars.map((r) => sharedCoverage(site, r.id));
    await Promise.all(apis.map((a) => a.setSite(site)));
    await Promise.all(apis.flatMap((a) => outputs.map((o, i) => a.setOutputs(i, o))));
    const n = site.frame.width * site.frame.height;
    const u8 = () => new Uint8Array(new SharedArrayBuffer(n));
    const fusionOut = new Map<string, { fused: FusedHeight; cellState: Uint8Array }>();
    site.targets.forEach((target, t) => {
      site.heightsAglM.forEach((h, k) => {
        if (!target.heightsAglM.includes(h)) return;
        const combinedPd = new Float32Array(new SharedArrayBuffer(4 * n));
        const fused = { combinedPd, overlapCount: u8(), bestRadar: u8(), gap: u8() };
        fusionOut.set(`${t}/${k}`, { fused, cellState: u8() });
      });
    });
    await Promise.all(apis.flatMap((a) => [...fusionOut].map(([key, o]) => a.setFusionOutputs(key, o))));
    const free = [...apis];
    const waiting: ((w: Comlink.Remote<SharedWorkerApi>) => void)[] = [];
    const withWorker = async <T>(f: (w: Comlink.Remote<SharedWorkerApi>) => Promise<T>): Promise<T> => {
      const w =
        free.length > 0
          ? free.pop()!
          : await new Promise<Comlink.Remote<SharedWorkerApi>>((res) => waiting.push(res));
      try {
        return await f(w);
      } finally {
        const next = waiting.shift();
        if (next) next(w);
        else free.push(w);
      }
    };
    const runRadar: RadarRunner = (_s, index, mode) =>
      withWorker(async (w) => {
        outputs[index].extent = await w.compute(index, mode);
        return outputs[index];
      });
    const runFusion: FusionRunner = (_s, job) =>
      withWorker(async (w) => {
        const metrics = await w.fuse(job);
        const o = fusionOut.get(`${job.targetIndex}/${job.heightIndex}`)!;
        return { ...o.fused, cellState: o.cellState, heightAglM: site.heightsAglM[job.heightIndex], metrics };
      });
    for (const fusionInWorkers of [false, true]) {
      const opts = fusionInWorkers ? { runRadar, runFusion } : { runRadar };
      let previous = await evaluateSite(site, opts); // warm-up
      const times: number[] = [];
      const radarMs: number[] = [];
      for (let r = 0; r < runs; r++) {
        const t = performance.now();
        previous = await evaluateSite(site, { ...opts, previous });
        times.push(performance.now() - t);
        radarMs.push(previous.timingsMs.radars);
      }
      const s = stats(times);
      // Same figures as one thread? (the metrics and every fused raster compared exactly)
      const same = previous.targets.every((t, j) =>
        t.heights.every(
          (h, k) =>
            JSON.stringify(h.metrics) === JSON.stringify(reference.targets[j].heights[k].metrics) &&
            h.combinedPd.every((v, i) => Object.is(v, reference.targets[j].heights[k].combinedPd[i])),
        ),
      );
      console.log(
        `coverage full evaluation (${same ? "same results as 1 thread" : "RESULTS DIFFER FROM 1 THREAD"}), ` +
          `2 workers, radar results in shared memory, ` +
          `${fusionInWorkers ? "fusion steps on the workers (shared outputs)" : "fusion on the main thread into the previous result"}: ` +
          `${fmt(s, 0)} ms (radar stages ${fmt(stats(radarMs), 0)} ms); speed-up ` +
          `${(singleReuseMs / s.median).toFixed(2)} × over 1 thread reusing`,
      );
    }
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}

/**
 * Where the single-thread full evaluation spends its time: per radar the horizon sweep and the radar
 * stage (into the previous run's arrays), then fusion and metrics. Medians over `runs`.
 */
async function benchBreakdown(runs: number): Promise<void> {
  const site = siteOn(5, planRadars, [10, 30, 60]);
  const n = SIDE * SIDE;
  const sweep: number[][] = site.radars.map(() => []);
  const stage: number[][] = site.radars.map(() => []);
  const kept: (RadarCoverage | undefined)[] = site.radars.map(() => undefined);
  for (let r = 0; r <= runs; r++) {
    site.radars.forEach((radar, i) => {
      const kernel = buildRadarKernel({
        radar,
        targets: site.targets,
        requirement: site.requirement,
        effectiveEarthFactor: site.effectiveEarthFactor,
      });
      let t = performance.now();
      const horizon = computeHorizon({
        surface: { ...site.frame, data: site.surface },
        observerX: radar.x,
        observerY: radar.y,
        antennaHeightAslM: radar.antennaHeightAslM,
        effectiveEarthFactor: site.effectiveEarthFactor,
        maxRangeM: Number.isFinite(kernel.maxRangeM) ? kernel.maxRangeM : undefined,
        mode: "accurate",
      });
      const ts = performance.now() - t;
      t = performance.now();
      kept[i] = radarCoverageFromHorizon({ ...site, radar }, kernel, horizon, kept[i]);
      const tc = performance.now() - t;
      if (r > 0) {
        sweep[i].push(ts);
        stage[i].push(tc);
      }
    });
  }
  const parts = site.radars.map(
    (radar, i) =>
      `${radar.id} sweep ${stats(sweep[i]).median.toFixed(0)} stage ${stats(stage[i]).median.toFixed(0)}`,
  );
  const sum = (xs: number[][]) => xs.reduce((a, x) => a + stats(x).median, 0);
  console.log(
    `coverage full-plan breakdown on ${n} cells, ms (medians of ${runs}): ${parts.join("; ")}; ` +
      `all sweeps ${sum(sweep).toFixed(0)}, all stages ${sum(stage).toFixed(0)}`,
  );
  let previous = await evaluateSite(site);
  const fusion: number[] = [];
  for (let r = 0; r < runs; r++) {
    previous = await evaluateSite(site, { previous });
    fusion.push(previous.timingsMs.fusion);
  }
  console.log(`coverage fusion and metrics (3 heights, 10 radars): ${fmt(stats(fusion), 0)} ms`);
}

/** Prints the coverage figures; never asserts. `parts`: "stage", "full" (default both). */
export async function run(parts: string[] = ["stage", "full"]): Promise<void> {
  if (parts.includes("stage")) {
    benchStage("rotating pulsed (kalvori-x9), 10 m cells", demoRadar("kalvori-x9"), 10, 7);
    benchStage("staring FMCW (mossbee-58), 0.5 m cells", demoRadar("mossbee-58"), 0.5, 7);
  }
  if (parts.includes("breakdown")) await benchBreakdown(3);
  if (parts.includes("full")) await benchFull(5);
  if (parts.includes("shared")) {
    // The shared-memory 2-worker run alone, against 1 thread writing into the previous result.
    const site = siteOn(5, planRadars, [10, 30, 60]);
    let previous = await evaluateSite(site);
    const one: number[] = [];
    for (let r = 0; r < 5; r++) {
      const t = performance.now();
      previous = await evaluateSite(site, { previous });
      one.push(performance.now() - t);
    }
    console.log(
      `coverage full evaluation, 1 thread, previous result's arrays reused: ${fmt(stats(one), 0)} ms`,
    );
    await benchShared(site, 5, stats(one).median);
  }
}

if (process.argv[1]?.endsWith("coverage.bench.ts")) {
  const parts = process.argv.slice(2);
  await run(parts.length > 0 ? parts : undefined);
}
