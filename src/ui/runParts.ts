/**
 * Putting the parts of an accurate run together (engine.ts splits a run over the workers): their
 * views into one view, and their progress reports into one fraction for the top bar.
 */
import type { CoverageView, RunProgress } from "../workers/protocol";

/**
 * The fraction of a run done, over its parts: per part, its radars count for RADAR_SHARE and its
 * fusion steps for the rest; a part's fraction never goes back (its second step starts its counts
 * again), and a finished part counts whole.
 */
export class RunProgressTracker {
  private readonly fractions: number[];
  constructor(
    count: number,
    private readonly publish: (fraction: number) => void,
  ) {
    this.fractions = new Array(count).fill(0);
  }
  report(part: number, p: RunProgress): void {
    const share = p.stage === "radars" ? RADAR_SHARE : 1 - RADAR_SHARE;
    const base = p.stage === "radars" ? 0 : RADAR_SHARE;
    const f = p.total > 0 ? base + (share * Math.min(p.done, p.total)) / p.total : base;
    if (f <= this.fractions[part]) return;
    this.fractions[part] = f;
    this.publish(this.fraction());
  }
  finish(part: number): void {
    this.fractions[part] = 1;
    this.publish(this.fraction());
  }
  fraction(): number {
    return this.fractions.reduce((a, f) => a + f, 0) / this.fractions.length;
  }
}

/** Share of a part's progress given to its radars (the rest to fusion and metrics). */
const RADAR_SHARE = 0.8;

/** Post ids in first-seen order, each once (both steps, or both parts, may name the same radar). */
export function unique(ids: (string[] | undefined)[]): string[] {
  return [...new Set(ids.flatMap((x) => x ?? []))];
}

/**
 * The views of the parts of one run as one view: every slice in the order of a whole run (classes,
 * then heights, as the parts list them in `classIds` and `heightsM`); the arrays common to all parts
 * (terrain) from the first; the lowest visible height from the part that merged it (one does).
 */
export function mergePartViews(parts: CoverageView[]): CoverageView {
  const [first] = parts;
  const slices = parts.flatMap((v) => v.slices);
  const order = (s: { classId: string; heightM: number }) =>
    first.classIds.indexOf(s.classId) * first.heightsM.length + first.heightsM.indexOf(s.heightM);
  slices.sort((a, b) => order(a) - order(b));
  return {
    ...first,
    slices,
    lowestVisibleAglM:
      parts.find((v) => v.lowestVisibleAglM.length > 0)?.lowestVisibleAglM ?? first.lowestVisibleAglM,
    notes: [...new Set(parts.flatMap((v) => v.notes))],
    elapsedMs: Math.max(...parts.map((v) => v.elapsedMs)),
    computedRadarIds: unique(parts.map((v) => v.computedRadarIds)),
  };
}
