/**
 * Masking on all cores: 8 observers' sweeps of one 2048² synthetic DEM (rough terrain with buildings,
 * 10 m cells, 15 m masts), in this thread, on 1 Node worker_thread and on 2 (4 observers each, the DEM
 * shared through a SharedArrayBuffer, each worker sweeping into its previous outputs, via comlink).
 * Prints M cells/s in all and per core, and the speed-up; medians and spreads, never asserted.
 * Run alone with `npx tsx tests/bench/maskWorkers.bench.ts`.
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import * as Comlink from "comlink";
import nodeEndpoint from "comlink/dist/esm/node-adapter.mjs";
import { DEFAULT_EFFECTIVE_EARTH_FACTOR } from "../../src/coverage/constants.ts";
import type { Grid } from "../../src/coverage/grid.ts";
import { computeHorizon, type HorizonResult, type MaskMode } from "../../src/coverage/terrainMask.ts";
import { syntheticDem } from "../fixtures/viewshed/syntheticDem.ts";
import { spread } from "./stats.ts";

const SIDE = 2048;
const CELL_M = 10;
const MAST_M = 15;
const OBSERVERS = 8;
const ROUNDS = 5;

interface WorkerApi {
  setSurface(grid: Grid): void;
  sweep(
    observers: { observerX: number; observerY: number; antennaHeightAslM: number }[],
    mode: MaskMode,
    k: number,
  ): number;
}

/** Observers on a 4 × 2 lattice over the grid, each on the surface plus the mast. */
function observersOf(g: Grid) {
  const out: { observerX: number; observerY: number; antennaHeightAslM: number }[] = [];
  for (let k = 0; k < OBSERVERS; k++) {
    const col = Math.floor(((k % 4) + 0.5) * (g.width / 4));
    const row = Math.floor((Math.floor(k / 4) + 0.5) * (g.height / 2));
    out.push({
      observerX: g.originX + (col + 0.5) * g.cellSizeM,
      observerY: g.originY - (row + 0.5) * g.cellSizeM,
      antennaHeightAslM: g.data[row * g.width + col] + MAST_M,
    });
  }
  return out;
}

export async function run(): Promise<void> {
  const dem = syntheticDem({ width: SIDE, height: SIDE, cellSizeM: CELL_M, seed: 2026, buildings: 1000 });
  const data = new Float32Array(new SharedArrayBuffer(dem.surface.data.byteLength));
  data.set(dem.surface.data);
  const surface: Grid = { ...dem.surface, data };
  const observers = observersOf(surface);
  const k = DEFAULT_EFFECTIVE_EARTH_FACTOR;
  const cells = SIDE * SIDE * OBSERVERS;
  const workers = [0, 1].map(() => new Worker(new URL("./maskWorker.mjs", import.meta.url)));
  const apis = workers.map((w) => Comlink.wrap<WorkerApi>(nodeEndpoint(w)));
  try {
    for (const api of apis) await api.setSurface(surface);
    console.log(
      `masking on all cores: ${OBSERVERS} observers on ${SIDE}² cells, ${availableParallelism()} cores`,
    );
    for (const mode of ["fast", "accurate"] as MaskMode[]) {
      let previous: HorizonResult | undefined;
      const here: number[] = [];
      const one: number[] = [];
      const two: number[] = [];
      for (const api of apis) await api.sweep(observers, mode, k); // warm-up
      for (let r = 0; r < ROUNDS + 1; r++) {
        let t = performance.now();
        for (const o of observers)
          previous = computeHorizon({ surface, ...o, effectiveEarthFactor: k, mode }, previous);
        if (r > 0) here.push(performance.now() - t);
        t = performance.now();
        await apis[0].sweep(observers, mode, k);
        if (r > 0) one.push(performance.now() - t);
        t = performance.now();
        await Promise.all([
          apis[0].sweep(observers.slice(0, OBSERVERS / 2), mode, k),
          apis[1].sweep(observers.slice(OBSERVERS / 2), mode, k),
        ]);
        if (r > 0) two.push(performance.now() - t);
      }
      const [h, o, t2] = [spread(here), spread(one), spread(two)];
      const rate = (ms: number) => cells / ms / 1e3; // M cells/s
      console.log(
        `  ${mode.padEnd(8)} this thread ${h.median.toFixed(0)} ms (${h.min.toFixed(0)}–${h.max.toFixed(0)}) → ${rate(h.median).toFixed(1)} M cells/s; ` +
          `1 worker ${o.median.toFixed(0)} ms → ${rate(o.median).toFixed(1)} M cells/s; ` +
          `2 workers ${t2.median.toFixed(0)} ms (${t2.min.toFixed(0)}–${t2.max.toFixed(0)}) → ${rate(t2.median).toFixed(1)} M cells/s, ` +
          `${(rate(t2.median) / 2).toFixed(1)} per core; speed-up ${(o.median / t2.median).toFixed(2)}× over 1 worker`,
      );
    }
  } finally {
    for (const w of workers) await w.terminate();
  }
}

if (process.argv[1]?.endsWith("maskWorkers.bench.ts")) await run();
