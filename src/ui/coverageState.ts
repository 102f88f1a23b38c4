/**
 * The latest coverage results and run status (not part of the plan, never undone).
 */
import { create } from "zustand";
import type { CoverageView, PointReply } from "../workers/protocol";

export interface CoverageState {
  /** The newest accurate (or plan-mode) view. */
  view: CoverageView | null;
  /** A fast preview while a post is dragged; shown instead of `view` while present. */
  preview: CoverageView | null;
  running: boolean;
  /** Fraction done (0…1) of the accurate run under way, or null. */
  progress: number | null;
  /** The generation being computed. */
  generation: number;
  /** A run that could not be done (bad plan, memory refusal); the previous view stays. */
  problem: string | null;
  point: PointReply | null;
  pointBusy: boolean;
  set: (patch: Partial<Omit<CoverageState, "set">>) => void;
}

export const useCoverage = create<CoverageState>()((set) => ({
  view: null,
  preview: null,
  running: false,
  progress: null,
  generation: 0,
  problem: null,
  point: null,
  pointBusy: false,
  set: (patch) => set(patch),
}));

/** The view to draw: the drag preview if any, else the last full view. */
export function shownView(s: Pick<CoverageState, "view" | "preview">): CoverageView | null {
  return s.preview ?? s.view;
}
