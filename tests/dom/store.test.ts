// @vitest-environment jsdom
import { beforeEach, describe, expect, it } from "vitest";
import { parsePlan } from "../../src/io/planValidation";
import { addPost, setAnalysisHeights, updatePost } from "../../src/ui/planEdits";
import { planToText, readPlanText } from "../../src/ui/planText";
import { freshId, freshIds, historyLabels, redo, undo, usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";

describe("plan store with undo/redo", () => {
  beforeEach(() => usePlanStore.getState().load(samplePlan()));

  it("the sample plan is valid", () => {
    const r = parsePlan(samplePlan());
    expect(r.ok ? [] : r.errors).toEqual([]);
  });

  it("undoes and redoes every change in order", () => {
    const s = usePlanStore.getState();
    s.change((p) => updatePost(p, "post-1", { mastHeightM: 20 }), "mast");
    s.change((p) => addPost(p, 15.301, 47.101).plan, "add post");
    expect(usePlanStore.getState().plan?.posts).toHaveLength(2);
    expect(undo()).toBe(true);
    expect(usePlanStore.getState().plan?.posts).toHaveLength(1);
    expect(usePlanStore.getState().plan?.posts[0].mastHeightM).toBe(20);
    expect(undo()).toBe(true);
    expect(usePlanStore.getState().plan?.posts[0].mastHeightM).toBe(12);
    expect(undo()).toBe(false);
    expect(redo()).toBe(true);
    expect(redo()).toBe(true);
    expect(redo()).toBe(false);
    expect(usePlanStore.getState().plan?.posts).toHaveLength(2);
  });

  it("names the change the next undo takes back and the next redo brings again", () => {
    const s = usePlanStore.getState();
    const labels = () =>
      historyLabels(usePlanStore.temporal.getState(), usePlanStore.getState().lastChangeLabel);
    expect(labels()).toEqual({ undo: null, redo: null });
    s.change((p) => updatePost(p, "post-1", { mastHeightM: 20 }), "mast height");
    s.change((p) => addPost(p, 15.301, 47.101).plan, "add post");
    expect(labels()).toEqual({ undo: "add post", redo: null });
    undo();
    expect(labels()).toEqual({ undo: "mast height", redo: "add post" });
    undo();
    expect(labels()).toEqual({ undo: null, redo: "mast height" });
    redo();
    expect(labels()).toEqual({ undo: "mast height", redo: "add post" });
  });

  it("records no step for a change that changes nothing", () => {
    const s = usePlanStore.getState();
    s.change((p) => updatePost(p, "post-1", { mastHeightM: 12 }));
    expect(usePlanStore.temporal.getState().pastStates).toHaveLength(0);
  });

  it("a new load clears the history", () => {
    usePlanStore.getState().change((p) => updatePost(p, "post-1", { tiltDeg: 2 }));
    usePlanStore.getState().load(samplePlan());
    expect(undo()).toBe(false);
  });

  it("keeps class heights inside the analysis heights", () => {
    const p = setAnalysisHeights(samplePlan(), [50, 5, 50]);
    expect(p.analysis.targetHeightsM).toEqual([5, 50]);
    expect(p.targetClasses[0].heightsAglM).toEqual([50]);
  });
});

describe("fresh identifiers", () => {
  it("skips used ids and gives, in one pass, the ids freshId would give one after another", () => {
    const existing = [{ id: "building-2" }, { id: "building-4" }, { id: "other-1" }];
    expect(freshId("building", existing)).toBe("building-1");
    expect(freshIds("building", existing, 4)).toEqual([
      "building-1",
      "building-3",
      "building-5",
      "building-6",
    ]);
    expect(freshIds("building", existing, 0)).toEqual([]);
    // One by one, each id added to the used ones before the next: the same list.
    const one: { id: string }[] = [...existing];
    for (let k = 0; k < 40; k++) one.push({ id: freshId("building", one) });
    expect(freshIds("building", existing, 40)).toEqual(one.slice(existing.length).map((e) => e.id));
  });

  it("gives twenty thousand distinct new ids around existing ones", () => {
    const existing = Array.from({ length: 5000 }, (_, k) => ({ id: `building-${2 * k + 1}` }));
    const ids = freshIds("building", existing, 20_000);
    expect(new Set(ids).size).toBe(20_000);
    const used = new Set(existing.map((e) => e.id));
    expect(ids.filter((id) => used.has(id))).toEqual([]);
    expect(ids[0]).toBe("building-2");
  });
});

describe("plan text", () => {
  it("round-trips a plan", () => {
    const r = readPlanText(planToText(samplePlan()), "a.json");
    expect(r.ok && r.plan).toEqual(samplePlan());
  });

  it("refuses a newer format version with a clear message", () => {
    const r = readPlanText(JSON.stringify({ ...samplePlan(), version: 99 }), "future.json");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/newer Picket \(plan format 99; this one reads up to 1\)/);
  });

  it("names the bad field and the JSON syntax position", () => {
    const bad = samplePlan();
    bad.posts[0].mastHeightM = 5200;
    const r = readPlanText(JSON.stringify(bad), "bad.json");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.details.join("\n")).toMatch(/posts\[0\]\.mastHeightM: 5200 is above the 300 m limit/);
    const s = readPlanText('{"version": 1,', "cut.json");
    expect(s.ok).toBe(false);
    if (!s.ok) expect(s.details[0]).toMatch(/line 1/);
  });
});
