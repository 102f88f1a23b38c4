/**
 * The kernels of browserKernels.bench.ts, bundled by that bench for Chromium: run on the page when
 * called as picketKernels(), or in a dedicated worker when posted a KernelRequest.
 */
/// <reference lib="webworker" />
import type { RadarModel } from "../../src/coverage/radarModel.ts";
import { stageTimes, sweepTimes } from "./stageSite.ts";

export interface KernelRequest {
  rotating: RadarModel;
  staring: RadarModel;
  side: number;
  runs: number;
}

/** Per kernel, ns per cell of each run. */
export type KernelTimes = Record<string, number[]>;

export function runKernels(req: KernelRequest): KernelTimes {
  return {
    "fast sweep": sweepTimes("fast", req.runs, req.side),
    "accurate sweep": sweepTimes("accurate", req.runs, req.side),
    "radar stage, rotating, 4 heights": stageTimes(req.rotating, 10, req.runs, req.side).reused,
    "radar stage, staring, 4 heights": stageTimes(req.staring, 0.5, req.runs, req.side).reused,
  };
}

const scope = globalThis as unknown as {
  picketKernels?: typeof runKernels;
  WorkerGlobalScope?: unknown;
} & Partial<DedicatedWorkerGlobalScope>;
if (scope.WorkerGlobalScope !== undefined && scope.postMessage !== undefined) {
  const post = scope.postMessage.bind(scope);
  scope.onmessage = (e: MessageEvent<KernelRequest>) => post(runKernels(e.data));
} else scope.picketKernels = runKernels;
