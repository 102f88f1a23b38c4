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
