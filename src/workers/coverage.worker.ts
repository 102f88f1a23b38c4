/// <reference lib="webworker" />
/**
 * A coverage worker: exposes the coverage API over comlink. Thin by design: everything it does is in
 * coverageApi.ts, which also runs inline (pool size 0). Views are returned in transfer lists.
 */
import * as Comlink from "comlink";
import { createCoverageApi } from "./coverageApi";
import type { CoverageApi } from "./protocol";
import { viewTransferables } from "./protocol";

const api = createCoverageApi({ warmWhenIdle: true });

const exposed: CoverageApi = {
  async evaluate(req, onProgress) {
    try {
      const view = await api.evaluate(req, onProgress);
      return Comlink.transfer(view, viewTransferables(view));
    } finally {
      // The listener came as a comlink proxy: close its channel once the run is over.
      (onProgress as Partial<Record<typeof Comlink.releaseProxy, () => void>> | undefined)?.[
        Comlink.releaseProxy
      ]?.();
    }
  },
  point: (req) => api.point(req),
  crashForTest: () => api.crashForTest(),
  supersede: (generation) => api.supersede(generation),
  settled: () => api.settled(),
};

Comlink.expose(exposed);
