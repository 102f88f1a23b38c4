// @vitest-environment jsdom
/**
 * The analysis panel: a run refused for memory offers the cell size that fits, as one undo step; the
 * target heights field commits a change once and shows the plan's heights after an undo.
 */
import { act } from "react";
import { createRoot } from "react-dom/client";
import { describe, expect, it } from "vitest";
import { cellSizeToFitM } from "../../src/io/siteGrid";
import { AnalysisPanel } from "../../src/ui/panels/AnalysisPanel";
import { redo, undo, usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

describe("analysis panel", () => {
  it("offers the smallest cell size that fits the memory budget and applies it", async () => {
    const plan = samplePlan();
    // Half-metre cells over the sample site with its class judged at 40 heights do not fit in 4 GiB.
    const heights = Array.from({ length: 40 }, (_, i) => 5 * (i + 1));
    plan.analysis = { ...plan.analysis, cellSizeM: 0.5, targetHeightsM: heights };
    plan.targetClasses = plan.targetClasses.map((t) => ({ ...t, heightsAglM: heights }));
    usePlanStore.getState().load(plan);
    const fit = cellSizeToFitM(plan);
    expect(fit).toBeGreaterThan(0.5);
    const host = document.createElement("div");
    document.body.append(host);
    const root = createRoot(host);
    await act(async () => root.render(<AnalysisPanel />));
    expect(host.textContent).toMatch(/above the 4\.00 GiB budget/);
    expect(host.querySelector('[data-testid="run-memory"]')?.textContent).toMatch(
      /^\d+\.\d\d GiB of 4\.00 GiB$/,
    );
    // One class judged at all 40 heights: 40 maps, the figure the memory depends on.
    expect(host.querySelector('[data-testid="run-slices"]')?.textContent).toBe(
      String(40 * plan.targetClasses.length),
    );
    const button = host.querySelector('[data-testid="cell-size-to-fit"]') as HTMLButtonElement;
    expect(button.textContent).toBe(`Use ${fit} m cells (the smallest that fit)`);
    await act(async () => button.click());
    expect(usePlanStore.getState().plan?.analysis.cellSizeM).toBe(fit);
    expect(host.querySelector('[data-testid="cell-size-to-fit"]')).toBeNull();
    expect(host.textContent).not.toMatch(/budget/);
    await act(async () => undo());
    expect(usePlanStore.getState().plan?.analysis.cellSizeM).toBe(0.5);
    await act(async () => root.unmount());
  });

  it("commits new heights once (Enter then leaving the field), shows the plan's after an undo, refuses '20 000'", async () => {
    usePlanStore.getState().load(samplePlan());
    const before = usePlanStore.getState().plan!.analysis.targetHeightsM;
    const host = document.createElement("div");
    document.body.append(host);
    const root = createRoot(host);
    await act(async () => root.render(<AnalysisPanel />));
    const input = () => host.querySelector('[data-testid="analysis-heights"]') as HTMLInputElement;
    const type = async (text: string) => {
      const setValue = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")!.set!;
      await act(async () => {
        setValue.call(input(), text);
        input().dispatchEvent(new Event("input", { bubbles: true }));
      });
      await act(async () => {
        input().dispatchEvent(new KeyboardEvent("keydown", { key: "Enter", bubbles: true }));
      });
      await act(async () => {
        input().dispatchEvent(new FocusEvent("focusout", { bubbles: true }));
      });
    };
    const steps = () => usePlanStore.temporal.getState().pastStates.length;
    const steps0 = steps();
    await type("25; 5, 25");
    expect(usePlanStore.getState().plan!.analysis.targetHeightsM).toEqual([5, 25]);
    expect(steps()).toBe(steps0 + 1);
    await act(async () => undo());
    expect(usePlanStore.getState().plan!.analysis.targetHeightsM).toEqual(before);
    expect(input().value).toBe(before.join(", "));
    await act(async () => redo());
    expect(input().value).toBe("5, 25");
    // A space inside one height is no separator: refused, the plan kept.
    await type("20 000");
    expect(host.textContent).toContain(
      'Target heights: "20 000" must be a number from 0 to 10000 m (separate heights with commas)',
    );
    expect(usePlanStore.getState().plan!.analysis.targetHeightsM).toEqual([5, 25]);
    await act(async () => root.unmount());
  });
});
