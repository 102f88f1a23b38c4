import { describe, expect, it } from "vitest";
import { spentArrays } from "../../src/ui/previewMemory";
import type { CoverageView } from "../../src/workers/protocol";

/** A view with one slice over `n` cells, its arrays as given (only what spentArrays reads). */
function view(
  pd: Float32Array,
  overlap: Uint8Array,
  gap: Uint8Array,
  lowest = new Float32Array(0),
): CoverageView {
  return {
    lowestVisibleAglM: lowest,
    slices: [{ combinedPd: pd, overlap, gap, perRadarPd: [] }],
  } as unknown as CoverageView;
}

describe("preview memory", () => {
  it("hands back each spent array once, never one a kept view shares, the terrain held, or an empty one", () => {
    const n = 16;
    const shared = new Uint8Array(n);
    const terrain = new Float32Array(n);
    const a = view(new Float32Array(n), new Uint8Array(n), shared, terrain);
    const b = view(new Float32Array(n), new Uint8Array(n), new Uint8Array(n));
    const kept = view(new Float32Array(n), new Uint8Array(n), shared);
    const out = spentArrays([a, b, a], [kept, null], [terrain.buffer]);
    const buffers = out.map((x) => x.buffer);
    expect(new Set(buffers).size).toBe(buffers.length);
    expect(buffers).not.toContain(shared.buffer);
    expect(buffers).not.toContain(terrain.buffer);
    expect(buffers).toContain(a.slices[0].combinedPd.buffer);
    expect(buffers).toContain(b.slices[0].gap.buffer);
    // a: Pd and overlap (its gap is shared, its lowest is the terrain); b: all three.
    expect(out.length).toBe(5);
  });
});
