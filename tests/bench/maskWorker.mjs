// worker_threads entry for the masking-on-all-cores benchmark: registers tsx, then serves sweeps of
// one shared surface (a SharedArrayBuffer the main thread posted once) over comlink, each into this
// worker's previous outputs, and reports the time of each sweep.
import { parentPort } from "node:worker_threads";
import { register } from "tsx/esm/api";

register();
const Comlink = await import("comlink");
const { default: nodeEndpoint } = await import("comlink/dist/esm/node-adapter.mjs");
const { computeHorizon } = await import("../../src/coverage/terrainMask.ts");
let surface = null;
let previous;
const api = {
  setSurface(grid) {
    surface = grid;
    previous = undefined;
  },
  /** Sweeps for each observer in turn; returns the wall time of all of them, ms. */
  sweep(observers, mode, effectiveEarthFactor) {
    if (surface === null) throw new Error("setSurface first");
    const t = performance.now();
    for (const o of observers) {
      previous = computeHorizon({ surface, ...o, effectiveEarthFactor, mode }, previous);
    }
    return performance.now() - t;
  },
};
Comlink.expose(api, nodeEndpoint(parentPort));
