/**
 * Turns the engine's SiteResult into the arrays the map layers draw (CoverageView). No physics: it
 * picks arrays out of the result; the per-radar Pd arrays are the engine's own (not copied).
 */
import type { PreparedSite, SiteResult } from "../coverage/evaluate";
import type { CoverageSlice, CoverageView } from "./protocol";

export interface ViewOptions {
  generation: number;
  notes: string[];
  elapsedMs: number;
  terrainKey: string;
  /** Send the ground and obstruction arrays (false when the receiver has them for this terrainKey). */
  withTerrain: boolean;
  /** The one radar whose Pd arrays are sent. */
  perRadarPostId: string | null;
}

export function toCoverageView(site: PreparedSite, result: SiteResult, o: ViewOptions): CoverageView {
  const slices: CoverageSlice[] = [];
  result.targets.forEach((t, ti) => {
    for (const h of t.heights) {
      const k = result.heightsAglM.indexOf(h.heightAglM);
      const perRadarPd = result.radars.map((r) => {
        if (r.radarId !== o.perRadarPostId) return new Float32Array(0);
        const pd = r.heights[k]?.targets[ti]?.pd;
        return pd ?? new Float32Array(h.combinedPd.length);
      });
      slices.push({
        classId: t.targetId,
        heightM: h.heightAglM,
        combinedPd: h.combinedPd,
        overlap: h.overlapCount,
        gap: h.gap,
        perRadarPd,
        metrics: h.metrics,
      });
    }
  });
  return {
    generation: o.generation,
    frame: result.frame,
    terrainKey: o.terrainKey,
    groundAmslM: o.withTerrain ? site.ground : new Float32Array(0),
    obstructionTopAglM: o.withTerrain ? site.obstructionTopAglM : new Float32Array(0),
    lowestVisibleAglM: result.lowestVisibleHeightAglM,
    heightsM: [...result.heightsAglM],
    classIds: result.targets.map((t) => t.targetId),
    radarPostIds: [...result.radarIds],
    slices,
    maskMode: site.maskMode,
    notes: o.notes,
    elapsedMs: o.elapsedMs,
    computedRadarIds: [...result.computedRadarIds],
  };
}

/**
 * Copies the arrays of a view that the worker keeps (cached per-radar Pd, the site's terrain, the
 * fused slices and lowest visible height its FusionMemo holds for the next run) so that transferring
 * the view leaves them intact.
 * `copyOf` makes each copy (default a new array; the worker passes its ready memory, warmBuffers.ts).
 */
export function cloneView(
  v: CoverageView,
  copyOf: <T extends Float32Array | Uint8Array>(a: T) => T = (a) => a.slice() as typeof a,
): CoverageView {
  const copies = new Map<ArrayBufferView, ArrayBufferView>();
  const c = <T extends Float32Array | Uint8Array>(a: T): T => {
    let out = copies.get(a);
    if (!out) {
      out = copyOf(a);
      copies.set(a, out);
    }
    return out as T;
  };
  return {
    ...v,
    groundAmslM: c(v.groundAmslM),
    obstructionTopAglM: c(v.obstructionTopAglM),
    lowestVisibleAglM: v.lowestVisibleAglM.length > 0 ? c(v.lowestVisibleAglM) : v.lowestVisibleAglM,
    slices: v.slices.map((s) => ({
      ...s,
      combinedPd: c(s.combinedPd),
      overlap: c(s.overlap),
      gap: c(s.gap),
      perRadarPd: s.perRadarPd.map(c),
    })),
  };
}
