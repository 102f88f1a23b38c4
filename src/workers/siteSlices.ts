/**
 * Sites limited to some of their (height, class) slices, and radar results seen through them: what
 * a preview computes (the shown slice), the two steps of a release (the shown slice, then the
 * others) and the parts of a run split over the workers. The radars always stay the same.
 */
import type { RadarCoverage } from "../coverage/coverage";
import type { PreparedSite } from "../coverage/evaluate";

/** The site limited to the (height, class) slices `keep` accepts (the radars stay the same). */
function restrictSite(site: PreparedSite, keep: (heightM: number, classId: string) => boolean): PreparedSite {
  const targets = site.targets
    .map((t) => ({ ...t, heightsAglM: t.heightsAglM.filter((h) => keep(h, t.id)) }))
    .filter((t) => t.heightsAglM.length > 0);
  return {
    ...site,
    targets,
    heightsAglM: site.heightsAglM.filter((h) => targets.some((t) => t.heightsAglM.includes(h))),
    requirement: {
      ...site.requirement,
      targetIds: site.requirement.targetIds.filter((id) => targets.some((t) => t.id === id)),
    },
  };
}

/** The class and height the map shows. */
export type Focus = { classId: string; heightM: number };

/** One string per (class, height). */
export function focusKey(f: Focus): string {
  return `${f.classId}@${f.heightM}`;
}

function holds(site: PreparedSite, f: Focus): boolean {
  return site.targets.some((t) => t.id === f.classId && t.heightsAglM.includes(f.heightM));
}

/** The site limited to one class at one height (a preview computes only what the map shows). */
export function focusSite(site: PreparedSite, f: Focus): PreparedSite {
  const slices = site.targets.reduce((n, t) => n + t.heightsAglM.length, 0);
  if (!holds(site, f) || slices === 1) return site;
  return restrictSite(site, (h, t) => h === f.heightM && t === f.classId);
}

/** Every slice of the site but the focused one (the caller holds that one already). */
function withoutFocus(site: PreparedSite, f: Focus): PreparedSite {
  if (!holds(site, f)) return site;
  return restrictSite(site, (h, t) => !(h === f.heightM && t === f.classId));
}

/**
 * Part `index` of `count` of the site's slices: the (height, class) pairs in height-major order cut
 * into equal runs, so that each part computes the SNR of as few heights as it can. The partition
 * depends on the site alone (not on the slice shown), so each worker's per-radar cache keys stay the
 * same from run to run.
 */
export function partSite(site: PreparedSite, part: { index: number; count: number }): PreparedSite {
  const pairs: string[] = [];
  for (const h of site.heightsAglM)
    for (const t of site.targets) if (t.heightsAglM.includes(h)) pairs.push(`${h}\u0000${t.id}`);
  const from = Math.floor((part.index * pairs.length) / part.count);
  const to = Math.floor(((part.index + 1) * pairs.length) / part.count);
  const mine = new Set(pairs.slice(from, to));
  return restrictSite(site, (h, t) => mine.has(`${h}\u0000${t}`));
}

/** The index of the part (of `count`, partSite) that holds the focused slice, or -1. */
export function partHolding(site: PreparedSite, count: number, f: Focus): number {
  for (let index = 0; index < count; index++) if (holds(partSite(site, { index, count }), f)) return index;
  return -1;
}

/**
 * Whether this step of a run merges the lowest visible height (EvaluateRequest.lowestShown): once per
 * run, by the step that brings it soonest. Shown: the step with the shown slice. Not shown: in a run
 * split into parts, a part without the shown slice (it replies in one step, while the part holding the
 * shown slice replies in two and has more to do); in one part, the step after the shown slice.
 */
export function mergesLowest(
  whole: PreparedSite,
  req: {
    part?: { index: number; count: number };
    focus?: Focus;
    sliceFirst?: boolean;
    shownSliceHeld?: boolean;
    lowestShown?: boolean;
  },
): boolean {
  const index = req.part?.index ?? 0;
  const count = req.part?.count ?? 1;
  const twoSteps = req.sliceFirst === true || req.shownSliceHeld === true;
  const byStep = !twoSteps || (req.sliceFirst ? req.lowestShown === true : req.lowestShown !== true);
  const holder = count > 1 && req.focus ? partHolding(whole, count, req.focus) : -1;
  if (holder < 0) return index === 0 && byStep;
  if (req.lowestShown) return index === holder && (!twoSteps || req.sliceFirst === true);
  return index === (holder === 0 ? 1 : 0);
}

/**
 * One radar's result of the full site seen as a result of `sub` (some of its slices): the same
 * arrays, picked out, nothing copied.
 */
export function narrowRadar(r: RadarCoverage, full: PreparedSite, sub: PreparedSite): RadarCoverage {
  const classIndex = sub.targets.map((t) => full.targets.findIndex((x) => x.id === t.id));
  return {
    ...r,
    heightsAglM: [...sub.heightsAglM],
    targetIds: sub.targets.map((t) => t.id),
    heights: sub.heightsAglM.map((h) => {
      const height = r.heights[full.heightsAglM.indexOf(h)];
      return { ...height, targets: classIndex.map((k) => height.targets[k]) };
    }),
  };
}

/**
 * The slices a step of an accurate release fuses: the shown one first (`sliceFirst`), then every
 * other (`shownSliceHeld`); a run in one step fuses them all.
 */
export function releaseStepSite(
  full: PreparedSite,
  f: Focus,
  step: { sliceFirst?: boolean; shownSliceHeld?: boolean },
): PreparedSite {
  if (step.sliceFirst) return focusSite(full, f);
  if (step.shownSliceHeld) return withoutFocus(full, f);
  return full;
}
