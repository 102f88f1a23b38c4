/**
 * Turns the engine's SiteResult into the arrays the map layers draw (CoverageView). No physics: it
 * picks arrays out of the result; the per-radar Pd arrays are the engine's own (not copied).
 */
import type { PreparedSite, SiteResult } from "../coverage/evaluate";
import type { CoverageSlice, CoverageView } from "./protocol";

export function toCoverageView(
  generation: number,
  site: PreparedSite,
  result: SiteResult,
  notes: string[],
  elapsedMs: number,
): CoverageView {
  const slices: CoverageSlice[] = [];
  result.targets.forEach((t, ti) => {
    for (const h of t.heights) {
      const k = result.heightsAglM.indexOf(h.heightAglM);
      const perRadarPd = result.radars.map((r) => {
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
    generation,
    frame: result.frame,
    groundAmslM: site.ground,
    obstructionTopAglM: site.obstructionTopAglM,
    lowestVisibleAglM: result.lowestVisibleHeightAglM,
    heightsM: [...result.heightsAglM],
    classIds: result.targets.map((t) => t.targetId),
    radarPostIds: [...result.radarIds],
    slices,
    maskMode: site.maskMode,
    notes,
    elapsedMs,
  };
}

/** Copies a view so that transferring it leaves the worker's cached arrays intact. */
export function cloneView(v: CoverageView): CoverageView {
  const copies = new Map<ArrayBufferView, ArrayBufferView>();
  const c = <T extends Float32Array | Uint8Array>(a: T): T => {
    let out = copies.get(a);
    if (!out) {
      out = a.slice() as T;
      copies.set(a, out);
    }
    return out as T;
  };
  return {
    ...v,
    groundAmslM: c(v.groundAmslM),
    obstructionTopAglM: c(v.obstructionTopAglM),
    lowestVisibleAglM: c(v.lowestVisibleAglM),
    slices: v.slices.map((s) => ({
      ...s,
      combinedPd: c(s.combinedPd),
      overlap: c(s.overlap),
      gap: c(s.gap),
      perRadarPd: s.perRadarPd.map(c),
    })),
  };
}
