// @vitest-environment jsdom
/** Target classes: deleted one at a time as one undo step each; the last one cannot be deleted. */
import { act } from "react";
import { createRoot } from "react-dom/client";
import { describe, expect, it } from "vitest";
import type { Plan } from "../../src/io/planSchema";
import { parsePlan } from "../../src/io/planValidation";
import { TargetsPanel } from "../../src/ui/panels/TargetsPanel";
import { removeTargetClass } from "../../src/ui/planEdits";
import { undo, usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

const ids = () => (usePlanStore.getState().plan as Plan).targetClasses.map((t) => t.id);

describe("target classes", () => {
  it("adds and deletes classes, keeps the last one, and every step undoes", async () => {
    usePlanStore.getState().load(samplePlan());
    const host = document.createElement("div");
    document.body.append(host);
    const root = createRoot(host);
    await act(async () => root.render(<TargetsPanel />));
    const first = ids()[0];
    const only = host.querySelector(`[data-testid="delete-class-${first}"]`) as HTMLButtonElement;
    expect(only.disabled).toBe(true);
    const add = Array.from(host.querySelectorAll("button")).find((b) => b.textContent === "Add target class");
    await act(async () => add?.click());
    expect(ids()).toHaveLength(2);
    const added = ids()[1];
    await act(async () =>
      (host.querySelector(`[data-testid="delete-class-${first}"]`) as HTMLButtonElement).click(),
    );
    expect(ids()).toEqual([added]);
    const r = parsePlan(JSON.parse(JSON.stringify(usePlanStore.getState().plan)));
    expect(r.ok ? [] : r.errors).toEqual([]);
    expect((host.querySelector(`[data-testid="delete-class-${added}"]`) as HTMLButtonElement).disabled).toBe(
      true,
    );
    await act(async () => undo());
    expect(ids()).toEqual([first, added]);
    // The edit itself refuses to leave a plan without a class.
    const one = samplePlan();
    expect(removeTargetClass(one, one.targetClasses[0].id)).toBe(one);
    await act(async () => root.unmount());
  });

  it("locks a class's last height with the reason, and frees it when another is ticked", async () => {
    const plan = samplePlan();
    const h = plan.analysis.targetHeightsM;
    plan.targetClasses = [{ ...plan.targetClasses[0], heightsAglM: [h[0]] }];
    usePlanStore.getState().load(plan);
    const host = document.createElement("div");
    document.body.append(host);
    const root = createRoot(host);
    await act(async () => root.render(<TargetsPanel />));
    const box = (m: number) =>
      Array.from(host.querySelectorAll(".field-check")).find(
        (f) => f.textContent === `${m} m AGL`,
      ) as HTMLElement;
    const input = (m: number) => box(m).querySelector("input") as HTMLInputElement;
    expect(input(h[0]).disabled).toBe(true);
    expect(box(h[0]).title).toBe("A class is judged at one height at least: tick another first");
    await act(async () => input(h[1]).click());
    expect((usePlanStore.getState().plan as Plan).targetClasses[0].heightsAglM).toEqual([h[0], h[1]]);
    expect(input(h[0]).disabled).toBe(false);
    expect(box(h[0]).title).toBe("");
    await act(async () => root.unmount());
  });
});
