/**
 * Which slice of the results is shown: the selected class and height, clamped to what the view has.
 */
import type { CoverageSlice, CoverageView, PointRadar, PointReply } from "../workers/protocol";

export function selectedSlice(
  view: CoverageView | null,
  classId: string | null,
  heightM: number | null,
): CoverageSlice | null {
  if (!view || view.slices.length === 0) return null;
  const cls = classId && view.classIds.includes(classId) ? classId : view.classIds[0];
  const ofClass = view.slices.filter((s) => s.classId === cls);
  if (ofClass.length === 0) return view.slices[0];
  return ofClass.find((s) => s.heightM === heightM) ?? ofClass[0];
}

/** The radars of an inspected point, highest Pd first. */
export function radarsByPd(point: PointReply | null): PointRadar[] {
  return [...(point?.radars ?? [])].sort((a, b) => b.pd - a.pd);
}

/**
 * The radars of a slice that alone meet the requirement nowhere: every cell where one meets it, another
 * meets it too (metrics' onlyThisRadarAreaM2 = 0). Candidates to remove or re-aim, one at a time: two of
 * them may share cells no third radar meets, and one below the requirement can still raise the combined Pd.
 */
export function postsMetElsewhere(slice: CoverageSlice): string[] {
  return slice.metrics.perRadar.filter((r) => r.onlyThisRadarAreaM2 === 0).map((r) => r.radarId);
}
