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
  const { computeRadarCoverage, fuseSiteHeight } = await import("../../src/coverage/evaluate.ts");
  const { cellStatesAtHeight } = await import("../../src/coverage/fusion.ts");
  /** Fusion step key "target/height" → its shared output arrays { fused, cellState }. */
  const fusionOutputs = new Map();
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
    setFusionOutputs(key, out) {
      fusionOutputs.set(key, out);
    },
    /** Fuse one class at one height into its shared arrays; returns the metrics. */
    fuse(job) {
      if (site === null) throw new Error("setSite first");
      const radars = site.radars.map((_, i) => {
        const r = outputs.get(i);
        r.extent = job.extents[i];
        return r;
      });
      const out = fusionOutputs.get(`${job.targetIndex}/${job.heightIndex}`);
      const h = site.heightsAglM[job.heightIndex];
      const cellState = cellStatesAtHeight(site.ground, site.obstructionTopAglM, h, out?.cellState);
      return fuseSiteHeight(site, radars, job, { cellState, fused: out?.fused }).metrics;
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
