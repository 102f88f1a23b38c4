/**
 * Drag previews without new memory: the arrays of previews the map no longer shows go back to the
 * preview worker with the next preview request (EvaluateRequest.recycled), which writes the next
 * previews into them (a WarmBuffers pool there). New memory costs about 1 ms per MB to
 * fault in, 6 bytes a cell per preview in the worker, 20 previews a second.
 */
import type { CoverageView } from "../workers/protocol";

/** The raster arrays a view brought (the terrain is the page's to keep, see engine.ts withTerrain). */
function rasterArrays(v: CoverageView): (Float32Array | Uint8Array)[] {
  return [v.lowestVisibleAglM, ...v.slices.flatMap((s) => [s.combinedPd, s.overlap, s.gap, ...s.perRadarPd])];
}

/** The arrays of `spent` views that no `kept` view shares and that are not `held`, once each. */
export function spentArrays(
  spent: CoverageView[],
  kept: (CoverageView | null)[],
  held: Iterable<ArrayBufferLike>,
): (Float32Array | Uint8Array)[] {
  const taken = new Set<ArrayBufferLike>(held);
  for (const v of kept) if (v) for (const a of rasterArrays(v)) taken.add(a.buffer);
  const out: (Float32Array | Uint8Array)[] = [];
  for (const v of spent)
    for (const a of rasterArrays(v)) {
      const b = a.buffer;
      if (b.byteLength === 0 || taken.has(b) || !(b instanceof ArrayBuffer)) continue;
      taken.add(b);
      out.push(a);
    }
  return out;
}

/**
 * Previews that landed, newest last. Those two landings back or more are no longer shown (the map has
 * drawn a newer one since).
 */
const landedPreviews: CoverageView[] = [];
const PREVIEWS_SHOWN_OR_DRAWING = 2;
/** At most this many buffers wait to go back (a few previews' worth). */
const RECYCLE_MAX = 24;
let recyclable: (Float32Array | Uint8Array)[] = [];

/** A preview landed; `held`: buffers the page keeps whatever happens (its terrain arrays). */
export function previewLanded(view: CoverageView, held: Iterable<ArrayBufferLike>): void {
  landedPreviews.push(view);
  const spent = landedPreviews.splice(0, Math.max(0, landedPreviews.length - PREVIEWS_SHOWN_OR_DRAWING));
  for (const a of spentArrays(spent, landedPreviews, held))
    if (recyclable.length < RECYCLE_MAX) recyclable.push(a);
}

/** The spent previews' memory for the next preview request (moved: the page holds it no longer). */
export function takeRecyclable(): (Float32Array | Uint8Array)[] {
  const list = recyclable;
  recyclable = [];
  return list;
}
