/**
 * The coverage worker of the benchmark (Node worker_threads + comlink): holds one PreparedSite and
 * computes radars of it on request, transferring the result arrays back (no copy).
 */
import { parentPort } from "node:worker_threads";
import * as Comlink from "comlink";
import nodeEndpoint from "comlink/dist/esm/node-adapter.mjs";
import type { RadarCoverage } from "../../src/coverage/coverage.ts";
import { computeRadarCoverage, type PreparedSite } from "../../src/coverage/evaluate.ts";
import type { MaskMode } from "../../src/coverage/terrainMask.ts";

let site: PreparedSite | null = null;

/** Every typed-array buffer of a radar result, for the transfer list. */
export function resultBuffers(r: RadarCoverage): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>([r.lowestVisibleHeightAglM.buffer as ArrayBuffer]);
  for (const h of r.heights) {
    out.add(h.snrDbAt0Dbsm.buffer as ArrayBuffer);
    for (const t of h.targets) {
      if (t.pd) out.add(t.pd.buffer as ArrayBuffer);
      if (t.reason) out.add(t.reason.buffer as ArrayBuffer);
    }
  }
  return [...out];
}

const kept = new Map<number, RadarCoverage>();

const api = {
  /** Diagnostic: compute radar `index` into this worker's previous result for it, return only the time. */
  computeRadarInPlace(index: number, mode: MaskMode): number {
    if (site === null) throw new Error("setSite first");
    const t = performance.now();
    kept.set(index, computeRadarCoverage(site, index, mode, kept.get(index)));
    return performance.now() - t;
  },
  setSite(s: PreparedSite): void {
    site = s;
  },
  /** Compute radar `index`, into `reuse`'s arrays when given (they arrive transferred); transfer back. */
  computeRadar(index: number, mode: MaskMode, reuse?: RadarCoverage): RadarCoverage {
    if (site === null) throw new Error("setSite first");
    const r = computeRadarCoverage(site, index, mode, reuse);
    return Comlink.transfer(r, resultBuffers(r));
  },
};
export type CoverageWorkerApi = typeof api;

if (parentPort) Comlink.expose(api, nodeEndpoint(parentPort));
