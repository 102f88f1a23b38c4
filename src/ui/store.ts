/**
 * The plan store: the plan document being edited, with undo/redo (zundo) for every plan change.
 * Only the plan is tracked by the history; view state lives in session.ts. The model never imports this.
 * A change is a function from the old plan to the new one, so components never mutate the plan.
 */
import { temporal } from "zundo";
import { create, useStore } from "zustand";
import type { Plan } from "../io/planSchema";

export interface PlanStore {
  plan: Plan | null;
  /** Applies one undoable change. `label` says what changed (shown after undo/redo). */
  change: (update: (plan: Plan) => Plan, label?: string) => void;
  /** Replaces the plan (open, new, restore) and clears the history. */
  load: (plan: Plan) => void;
  /** What the last change was, for the status line. */
  lastChangeLabel: string;
  /** Counts loads (open, new, restore), so views can react to a different plan but not to edits. */
  loadCount: number;
}

/** How many changes can be undone. */
export const UNDO_LIMIT = 200;

export const usePlanStore = create<PlanStore>()(
  temporal(
    (set) => ({
      plan: null,
      lastChangeLabel: "",
      loadCount: 0,
      change: (update, label = "edit") =>
        set((s) => {
          if (!s.plan) return s;
          const next = update(s.plan);
          return next === s.plan ? s : { plan: next, lastChangeLabel: label };
        }),
      load: (plan) => {
        set((s) => ({ plan, lastChangeLabel: "opened", loadCount: s.loadCount + 1 }));
        usePlanStore.temporal.getState().clear();
      },
    }),
    {
      // The label travels with its plan: undo brings back the label of the change that made the plan
      // it returns to, so "Undo …" always names the change the next undo takes back.
      partialize: (s) => ({ plan: s.plan, lastChangeLabel: s.lastChangeLabel }),
      equality: (a, b) => a.plan === b.plan,
      limit: UNDO_LIMIT,
    },
  ),
);

/** What the next undo and redo would take back or bring again (null when there is nothing). */
export function historyLabels(h: ReturnType<typeof usePlanStore.temporal.getState>, current: string) {
  const next = h.futureStates[h.futureStates.length - 1];
  return {
    undo: h.pastStates.length > 0 ? current : null,
    redo: next ? (next.lastChangeLabel ?? "edit") : null,
  };
}

/** Undo the last plan change; false when there is nothing to undo. */
export function undo(): boolean {
  const t = usePlanStore.temporal.getState();
  if (t.pastStates.length === 0) return false;
  t.undo();
  return true;
}

/** Redo the last undone change; false when there is nothing to redo. */
export function redo(): boolean {
  const t = usePlanStore.temporal.getState();
  if (t.futureStates.length === 0) return false;
  t.redo();
  return true;
}

/** Current plan (throws before a plan is loaded: the app always loads one at start). */
export function currentPlan(): Plan {
  const p = usePlanStore.getState().plan;
  if (!p) throw new Error("no plan loaded");
  return p;
}

/** A new identifier not used by any of `existing`, as prefix-1, prefix-2, … */
export function freshId(prefix: string, existing: ReadonlyArray<{ id: string }>): string {
  return freshIds(prefix, existing, 1)[0];
}

/**
 * `count` new identifiers, distinct and not used by any of `existing`: the first `count` of prefix-1,
 * prefix-2, … that are free, the ids freshId would give one after another. One pass, so that an import
 * of ten thousand footprints does not rebuild the set of used ids for each (quadratic: seconds).
 */
export function freshIds(prefix: string, existing: ReadonlyArray<{ id: string }>, count: number): string[] {
  const used = new Set(existing.map((e) => e.id));
  const ids: string[] = [];
  for (let i = 1; ids.length < count; i++) {
    const id = `${prefix}-${i}`;
    if (!used.has(id)) ids.push(id);
  }
  return ids;
}

/** React hook on the undo history (e.g. whether undo is possible). */
export function useHistory<T>(selector: (h: ReturnType<typeof usePlanStore.temporal.getState>) => T): T {
  return useStore(usePlanStore.temporal, selector);
}
