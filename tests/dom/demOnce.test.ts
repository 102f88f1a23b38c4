// @vitest-environment jsdom
import { describe, expect, it } from "vitest";
import { useAssets } from "../../src/ui/assets";
import { withDem } from "../../src/ui/engine";
import type { WorkerPool } from "../../src/workers/pool";
import type { CoverageApi, DemPayload } from "../../src/workers/protocol";

const pool = { size: 2 } as WorkerPool<CoverageApi>;

describe("the DEM sent to the workers", () => {
  it("goes with its bytes once per worker, by id after that, and again when a worker lacks it", async () => {
    useAssets.getState().setDem({ fileName: "terrain.tif", bytes: new ArrayBuffer(16) });
    const sent: { slot: number; bytes: boolean; id?: string }[] = [];
    const send =
      (slot: number, refuse = false) =>
      (dem: DemPayload | null) => {
        sent.push({ slot, bytes: dem?.bytes !== undefined, id: dem?.id });
        if (refuse && dem?.bytes === undefined)
          return Promise.reject(Object.assign(new Error("no DEM here"), { name: "DemMissingError" }));
        return Promise.resolve(slot);
      };
    await withDem(pool, 0, send(0));
    await withDem(pool, 0, send(0));
    await withDem(pool, 1, send(1));
    await withDem(pool, 3, send(3)); // slot 3 is worker 1 of 2
    // Worker 0 replaced behind the page's back: it refuses the id alone and gets the bytes.
    await withDem(pool, 0, send(0, true));
    expect(sent.map((s) => [s.slot, s.bytes])).toEqual([
      [0, true],
      [0, false],
      [1, true],
      [3, false],
      [0, false],
      [0, true],
    ]);
    const ids = new Set(sent.map((s) => s.id));
    expect(ids.size).toBe(1);
    // A new DEM (same name and size) is a new id, with its bytes again.
    useAssets.getState().setDem({ fileName: "terrain.tif", bytes: new ArrayBuffer(16) });
    await withDem(pool, 0, send(0));
    expect(sent[sent.length - 1].bytes).toBe(true);
    expect(ids.has(sent[sent.length - 1].id)).toBe(false);
    // Other errors are not taken for a missing DEM.
    await expect(withDem(pool, 1, () => Promise.reject(new Error("plan invalid")))).rejects.toThrow(
      "plan invalid",
    );
  });
});
