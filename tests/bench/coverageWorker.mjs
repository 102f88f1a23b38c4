// worker_threads entry for the coverage benchmark: registers tsx so the TypeScript worker API loads
// (a Worker pointed straight at a .ts file fails under tsx). With workerData { shared: true } it
// serves the shared-memory API below instead: the radar results live in SharedArrayBuffers that the
// main thread allocated once and posted to every worker, each stage writes into them in place, and
// only the visited extent travels back (no transfer, no new memory per run).
import { parentPort, workerData } from "node:worker_threads";
import { register } from "tsx/esm/api";

register();
if (workerData?.shared) {
  const Comlink = await import("comlink");
  const { default: nodeEndpoint } = await import("comlink/dist/esm/node-adapter.mjs");
  const { computeRadarCoverage } = await import("../../src/coverage/evaluate.ts");
  let site = null;
  /** Radar index → its result object whose arrays are views on shared memory. */
  const outputs = new Map();
  const api = {
    setSite(s) {
      site = s;
    },
    setOutputs(index, coverage) {
      outputs.set(index, coverage);
    },
    /** Compute radar `index` into its shared arrays; returns the square its stage visited. */
    compute(index, mode) {
      if (site === null) throw new Error("setSite first");
      const r = computeRadarCoverage(site, index, mode, outputs.get(index));
      outputs.set(index, r);
      return r.extent;
    },
  };
  Comlink.expose(api, nodeEndpoint(parentPort));
} else {
  await import("./coverageWorkerApi.ts");
}
