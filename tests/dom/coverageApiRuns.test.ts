import { describe, expect, it } from "vitest";
import type { Plan } from "../../src/io/planSchema";
import { siteGridFrame } from "../../src/io/siteGrid";
import { mergePartViews } from "../../src/ui/runParts";
import { createCoverageApi } from "../../src/workers/coverageApi";
import { type CoverageView, type EvaluateRequest, viewTransferables } from "../../src/workers/protocol";
import { ridgeDemoDem as dem, ridgeDemoPlan as demoPlan } from "./ridgeDemo";

let generation = 0;
function request(plan: Plan, extra: Partial<EvaluateRequest> = {}): EvaluateRequest {
  return { generation: ++generation, plan, dem: dem(), perRadarPostId: null, ...extra };
}

/** The demo plan with its south gate post (a ground post inside the grid) moved by `k` small steps. */
function moved(plan: Plan, k: number): { plan: Plan; postId: string } {
  const i = plan.posts.findIndex((p) => p.id === "south-gate");
  const m: Plan = structuredClone(plan);
  m.posts[i].position.lonDeg += 0.00002 * k;
  m.posts[i].position.latDeg -= 0.00001 * k;
  return { plan: m, postId: m.posts[i].id };
}

/** A view as the page receives it from a worker: cloned with its buffers transferred. */
function sent(v: CoverageView): CoverageView {
  return structuredClone(v, { transfer: viewTransferables(v) });
}

function sliceOf(v: CoverageView, classId: string, heightM: number) {
  const s = v.slices.find((x) => x.classId === classId && x.heightM === heightM);
  if (!s) throw new Error(`no slice ${classId} at ${heightM} m`);
  return s;
}

describe("coverage API runs", () => {
  it("gives the shown slice first with the figures of the full run, then the other slices from the cache", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
    const api = createCoverageApi();
    // Both steps of a release carry the same generation.
    const req = request(plan, { focus });
    const first = await api.evaluate({ ...req, sliceFirst: true });
    expect(first.partial).toBe(true);
    expect(first.slices.map((s) => [s.classId, s.heightM])).toEqual([[focus.classId, focus.heightM]]);
    const enabled = plan.posts.filter((p) => p.enabled).map((p) => p.id);
    expect([...(first.computedRadarIds ?? [])].sort()).toEqual([...enabled].sort());
    // The shown slice goes without its gap outlines; they come with the next step.
    expect(sliceOf(first, focus.classId, focus.heightM).gapShapes).toBeUndefined();

    const rest = await api.evaluate({ ...req, shownSliceHeld: true });
    expect(rest.partial).toBeUndefined();
    expect(rest.computedRadarIds).toEqual([]);
    // The caller holds the shown slice from the first step: it is not fused again.
    expect(rest.slices.some((s) => s.classId === focus.classId && s.heightM === focus.heightM)).toBe(false);
    const reference = await createCoverageApi().evaluate(request(plan, { focus }));
    expect(rest.slices.length).toBe(reference.slices.length - 1);
    for (const s of reference.slices) {
      if (s.classId === focus.classId && s.heightM === focus.heightM) continue;
      const r = sliceOf(rest, s.classId, s.heightM);
      expect(r.metrics).toEqual(s.metrics);
      expect(Array.from(r.combinedPd)).toEqual(Array.from(s.combinedPd));
    }
    const shown = sliceOf(first, focus.classId, focus.heightM);
    const same = sliceOf(reference, focus.classId, focus.heightM);
    expect(same.gapShapes?.labels.length).toBeGreaterThan(0);
    expect(rest.shownGapShapes).toEqual(same.gapShapes);
    expect(shown.metrics).toEqual(same.metrics);
    expect(Array.from(shown.combinedPd)).toEqual(Array.from(same.combinedPd));
    expect(Array.from(shown.gap)).toEqual(Array.from(same.gap));
    // The lowest visible height is merged once per run: by the second step unless the map shows it.
    expect(first.lowestVisibleAglM.length).toBe(0);
    expect(Array.from(rest.lowestVisibleAglM)).toEqual(Array.from(reference.lowestVisibleAglM));
    const shownReq = request(plan, { focus, lowestShown: true });
    const shownFirst = await api.evaluate({ ...shownReq, sliceFirst: true });
    const shownRest = await api.evaluate({ ...shownReq, shownSliceHeld: true });
    expect(Array.from(shownFirst.lowestVisibleAglM)).toEqual(Array.from(reference.lowestVisibleAglM));
    expect(shownRest.lowestVisibleAglM.length).toBe(0);
  });

  it("merges no lowest visible height while the page does not show it, and merges it from the cache when asked", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
    const reference = await createCoverageApi().evaluate(request(plan, { focus }));
    const api = createCoverageApi();
    for (let index = 0; index < 2; index++) {
      const req = request(plan, { focus, skipLowest: true, part: { index, count: 2 } });
      const first = await api.evaluate({ ...req, sliceFirst: true });
      const rest = first.partial ? await api.evaluate({ ...req, shownSliceHeld: true }) : null;
      expect([first, rest].map((v) => v?.lowestVisibleAglM.length ?? 0)).toEqual([0, 0]);
    }
    // The layer is shown: one run, every radar from the cache, brings it.
    const shown = await api.evaluate(
      request(plan, { focus, lowestShown: true, part: { index: 0, count: 2 } }),
    );
    expect(shown.computedRadarIds).toEqual([]);
    expect(Array.from(shown.lowestVisibleAglM)).toEqual(Array.from(reference.lowestVisibleAglM));
  });

  it("prepares the terrain again for a new DEM of the same name and size", async () => {
    const plan = demoPlan();
    const api = createCoverageApi();
    const first = await api.evaluate(request(plan, { dem: { ...dem(), id: "dem-a" } }));
    // The same file with every height set to 900 m (600 × 600 uncompressed Float32, strips at its end).
    const edited = dem();
    new Float32Array(edited.bytes, edited.bytes.byteLength - 600 * 600 * 4, 600 * 600).fill(900);
    const second = await api.evaluate(request(plan, { dem: { ...edited, id: "dem-b" } }));
    expect(Array.from(second.groundAmslM)).not.toEqual(Array.from(first.groundAmslM));
    expect(second.groundAmslM.every((g) => g === 900)).toBe(true);
  });

  it("takes the DEM's bytes once and its id after that; without them a new worker says so by name", async () => {
    const plan = demoPlan();
    const api = createCoverageApi();
    const withBytes = await api.evaluate(request(plan, { dem: { ...dem(), id: "dem-1" } }));
    const byId = await api.evaluate(request(plan, { dem: { fileName: "terrain.tif", id: "dem-1" } }));
    expect(Array.from(byId.slices[0].combinedPd)).toEqual(Array.from(withBytes.slices[0].combinedPd));
    const fresh = createCoverageApi();
    await expect(
      fresh.evaluate(request(plan, { dem: { fileName: "terrain.tif", id: "dem-1" } })),
    ).rejects.toMatchObject({ name: "DemMissingError" });
    // Another id than the one held is not taken for it either.
    await expect(
      api.evaluate(request(plan, { dem: { fileName: "terrain.tif", id: "dem-2" } })),
    ).rejects.toMatchObject({ name: "DemMissingError" });
  });

  it("a run split in parts over two workers, put together, equals the whole run", async () => {
    const plan = demoPlan();
    const post = plan.posts.find((p) => p.enabled);
    const focus = { classId: plan.targetClasses[1].id, heightM: plan.analysis.targetHeightsM[2] };
    const whole = await createCoverageApi().evaluate(request(plan, { focus, perRadarPostId: post?.id }));
    const parts: CoverageView[] = [];
    for (let index = 0; index < 2; index++) {
      const api = createCoverageApi();
      const req = request(plan, { focus, perRadarPostId: post?.id, part: { index, count: 2 } });
      const first = await api.evaluate({ ...req, sliceFirst: true });
      // The part holding the shown slice gives it first; the other part comes whole at once.
      const holds = first.slices.some((s) => s.classId === focus.classId && s.heightM === focus.heightM);
      expect(first.partial === true).toBe(holds && first.slices.length === 1);
      if (!first.partial) parts.push(first);
      else {
        const rest = await api.evaluate({ ...req, shownSliceHeld: true });
        parts.push({ ...rest, slices: [...first.slices, ...rest.slices] });
      }
    }
    // Height-major halves: 2 classes × 3 heights gives three slices each, no slice in both.
    expect(parts.map((v) => v.slices.length)).toEqual([3, 3]);
    const merged = mergePartViews(parts);
    expect(merged.slices.map((s) => [s.classId, s.heightM])).toEqual(
      whole.slices.map((s) => [s.classId, s.heightM]),
    );
    for (const s of whole.slices) {
      const m = sliceOf(merged, s.classId, s.heightM);
      expect(m.metrics).toEqual(s.metrics);
      expect(Array.from(m.combinedPd)).toEqual(Array.from(s.combinedPd));
      expect(Array.from(m.overlap)).toEqual(Array.from(s.overlap));
      expect(Array.from(m.gap)).toEqual(Array.from(s.gap));
      expect(m.perRadarPd.map((a) => a.length)).toEqual(s.perRadarPd.map((a) => a.length));
      for (let r = 0; r < s.perRadarPd.length; r++)
        expect(Array.from(m.perRadarPd[r])).toEqual(Array.from(s.perRadarPd[r]));
    }
    expect(Array.from(merged.lowestVisibleAglM)).toEqual(Array.from(whole.lowestVisibleAglM));
    // One part merges it: the one without the shown slice (part 1 holds it here).
    expect(parts.map((v) => v.lowestVisibleAglM.length > 0)).toEqual([true, false]);
    // With the shown slice in part 0, part 1 merges it; shown on the map, part 0's first step does.
    const early = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[0] };
    for (const lowestShown of [false, true]) {
      const got: boolean[] = [];
      for (let index = 0; index < 2; index++) {
        const req = request(plan, { focus: early, lowestShown, part: { index, count: 2 } });
        const api = createCoverageApi();
        const first = await api.evaluate({ ...req, sliceFirst: true });
        const rest = first.partial ? await api.evaluate({ ...req, shownSliceHeld: true }) : null;
        got.push(first.lowestVisibleAglM.length > 0, (rest?.lowestVisibleAglM.length ?? 0) > 0);
        const mine = [first, rest].find((v) => v !== null && v.lowestVisibleAglM.length > 0);
        if (mine) expect(Array.from(mine.lowestVisibleAglM)).toEqual(Array.from(whole.lowestVisibleAglM));
      }
      expect(got).toEqual(lowestShown ? [true, false, false, false] : [false, false, true, false]);
    }
    expect(merged.heightsM).toEqual(whole.heightsM);
    expect(merged.classIds).toEqual(whole.classIds);
  });

  it("stops a run once a newer generation is announced, and runs the newer one in full", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[0] };
    const api = createCoverageApi();
    for (const extra of [{}, { focus, sliceFirst: true }]) {
      const old = request(plan, extra);
      const running = api.evaluate(old);
      await api.supersede(old.generation + 1);
      await expect(running).rejects.toMatchObject({ name: "CancelledError" });
    }
    const next = await api.evaluate(request(plan, { focus, sliceFirst: true }));
    expect(next.partial).toBe(true);
    expect(next.computedRadarIds?.length).toBe(plan.posts.filter((p) => p.enabled).length);
  });

  it("recomputes only the moved radar on release, however long the drag previews went on", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[0] };
    const api = createCoverageApi();
    await api.evaluate(request(plan));
    // More preview steps than the per-radar cache holds entries: each stores one for the moved radar.
    const steps = 70;
    for (let k = 1; k <= steps; k++)
      await api.evaluate(request(moved(plan, k).plan, { maskMode: "fast", focus }));
    const end = moved(plan, steps);
    // The grid frame (bounded by the posts) stays the same, so the other radars' keys are unchanged.
    expect(siteGridFrame(end.plan).frame).toEqual(siteGridFrame(plan).frame);
    const release = await api.evaluate(request(end.plan));
    expect(release.computedRadarIds).toEqual([end.postId]);
  });

  it("writes a preview into the memory of spent previews handed back, with the figures of one in new memory", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
    const api = createCoverageApi();
    const opened = await api.evaluate(request(plan));
    // As the page asks during a drag: it holds the terrain and does not show the lowest visible height.
    const ask = { maskMode: "fast" as const, focus, haveTerrainKey: opened.terrainKey, skipLowest: true };
    const preview = (k: number, recycled?: (Float32Array | Uint8Array)[]) =>
      api.evaluate(request(moved(plan, k).plan, { ...ask, recycled }));
    // As the page receives it: the buffers transferred out of the worker.
    const spent = sent(await preview(1));
    const arrays = spent.slices.flatMap((x) => [x.combinedPd, x.overlap, x.gap, ...x.perRadarPd]);
    const handedBack = viewTransferables(spent) as ArrayBuffer[];
    expect(handedBack.length).toBeGreaterThan(0);
    const next = await preview(
      2,
      arrays.filter((a) => a.byteLength > 0),
    );
    const written = viewTransferables(next);
    expect(written.length).toBe(handedBack.length);
    for (const b of written) expect(handedBack.includes(b as ArrayBuffer)).toBe(true);
    // The same move previewed by an API that had no memory handed back.
    const fresh = createCoverageApi();
    await fresh.evaluate(request(plan));
    const want = sliceOf(
      await fresh.evaluate(request(moved(plan, 2).plan, { ...ask })),
      focus.classId,
      focus.heightM,
    );
    const slice = sliceOf(next, focus.classId, focus.heightM);
    expect(slice.metrics).toEqual(want.metrics);
    expect(Array.from(slice.combinedPd)).toEqual(Array.from(want.combinedPd));
    expect(Array.from(slice.overlap)).toEqual(Array.from(want.overlap));
    expect(Array.from(slice.gap)).toEqual(Array.from(want.gap));
  });

  it("a preview of the plan as it stands, computed without replying arrays, leaves the first preview of a drag only the moved radar", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
    const ask = { maskMode: "fast" as const, focus, skipLowest: true };
    const enabled = plan.posts.filter((p) => p.enabled).length;
    // Without it, the first preview computes every radar in fast masking.
    const cold = createCoverageApi();
    await cold.evaluate(request(plan));
    const first = await cold.evaluate(request(moved(plan, 1).plan, ask));
    expect(first.computedRadarIds).toHaveLength(enabled);
    // As the page asks once an accurate run has landed (engine.ts warmPreviews).
    const api = createCoverageApi();
    await api.evaluate(request(plan));
    const warmed = await api.evaluate(request(plan, { ...ask, cacheOnly: true }));
    expect(warmed.computedRadarIds).toHaveLength(enabled);
    expect(warmed.slices).toEqual([]);
    const next = await api.evaluate(request(moved(plan, 1).plan, ask));
    expect(next.computedRadarIds).toEqual([moved(plan, 1).postId]);
    const a = sliceOf(next, focus.classId, focus.heightM);
    const b = sliceOf(first, focus.classId, focus.heightM);
    expect(a.metrics).toEqual(b.metrics);
    expect(Array.from(a.combinedPd)).toEqual(Array.from(b.combinedPd));
    expect(Array.from(a.gap)).toEqual(Array.from(b.gap));
  });

  it("a post moved again and again writes into results that left the cache, with the figures of a fresh run", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
    const api = createCoverageApi();
    await api.evaluate(request(plan));
    // Each move adds a result for the post; past the three kept per post, the oldest leaves and the
    // next move's radar is written into its arrays. Moving back and forth also brings kept ones back.
    let last: CoverageView | null = null;
    let end = moved(plan, 0);
    let outlined = 0;
    const seen = new Set<number>();
    for (const k of [1, 2, 3, 4, 5, 6, 5, 7]) {
      end = moved(plan, k);
      const req = request(end.plan, { focus, perRadarPostId: end.postId });
      // Each view as the page receives it: its buffers transferred, as the worker sends them.
      const first = sent(await api.evaluate({ ...req, sliceFirst: true }));
      const rest = sent(await api.evaluate({ ...req, shownSliceHeld: true }));
      // Position 5 is kept from two moves before: nothing is computed.
      expect(first.computedRadarIds).toEqual(seen.has(k) ? [] : [end.postId]);
      seen.add(k);
      if ((rest.shownGapShapes?.labels.length ?? 0) > 0) outlined++;
      last = { ...rest, slices: [...first.slices, ...rest.slices] };
    }
    // Every release brought the shown slice's outlines (found again only for new gap cells).
    expect(outlined).toBe(8);
    const fresh = await createCoverageApi().evaluate(
      request(end.plan, { focus, perRadarPostId: end.postId }),
    );
    if (last === null) throw new Error("no run");
    expect(Array.from(last.lowestVisibleAglM)).toEqual(Array.from(fresh.lowestVisibleAglM));
    for (const s of fresh.slices) {
      const m = sliceOf(last, s.classId, s.heightM);
      expect(m.metrics).toEqual(s.metrics);
      expect(Array.from(m.combinedPd)).toEqual(Array.from(s.combinedPd));
      const r = fresh.radarPostIds.indexOf(end.postId);
      expect(Array.from(m.perRadarPd[r])).toEqual(Array.from(s.perRadarPd[r]));
    }
  });

  it("prepares a spare radar result and the copies of its slices while idle, and the next release uses them", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
    const api = createCoverageApi({ warmWhenIdle: true });
    const first = await api.evaluate(request(plan, { part: { index: 1, count: 2 } }));
    // Nothing is prepared between the steps of a run: only once the page says the run settled.
    await api.whenIdle();
    expect(api.readyCounts(first.slices[0].combinedPd)).toEqual({ spareRadars: 0, arrays: 0 });
    await api.settled();
    await api.whenIdle();
    const like = first.slices[0].combinedPd;
    // One spare radar, and a ready Float32 array for each of the part's three slices and one for
    // the lowest visible height.
    expect(api.readyCounts(like)).toEqual({ spareRadars: 1, arrays: 4 });
    const end = moved(plan, 3);
    const release = await api.evaluate(request(end.plan, { focus, part: { index: 1, count: 2 } }));
    expect(release.computedRadarIds).toEqual([end.postId]);
    // The release took them (part 1 merges the lowest visible height: the shown slice is in part 0);
    // idle again, the worker prepares new ones.
    expect(release.lowestVisibleAglM.length).toBeGreaterThan(0);
    expect(api.readyCounts(like)).toEqual({ spareRadars: 0, arrays: 0 });
    await api.settled();
    await api.whenIdle();
    expect(api.readyCounts(like)).toEqual({ spareRadars: 1, arrays: 4 });
    const fresh = await createCoverageApi().evaluate(
      request(end.plan, { focus, part: { index: 1, count: 2 } }),
    );
    expect(release.slices.map((x) => x.metrics)).toEqual(fresh.slices.map((x) => x.metrics));
    expect(Array.from(release.lowestVisibleAglM)).toEqual(Array.from(fresh.lowestVisibleAglM));
    release.slices.forEach((x, k) => {
      expect(Array.from(x.combinedPd)).toEqual(Array.from(fresh.slices[k].combinedPd));
      expect(Array.from(x.gap)).toEqual(Array.from(fresh.slices[k].gap));
    });
  });
  it("computes a release ahead without replying arrays, and the release then takes everything from it", async () => {
    const plan = demoPlan();
    const focus = { classId: plan.targetClasses[0].id, heightM: plan.analysis.targetHeightsM[1] };
    // As the page asks for part 0 of a release, first step: the opening run, then ahead of a drop.
    const ask = { focus, sliceFirst: true, part: { index: 0, count: 2 } };
    const api = createCoverageApi();
    await api.evaluate(request(plan, ask));
    const end = moved(plan, 4);
    const ahead = await api.evaluate(request(end.plan, { ...ask, cacheOnly: true }));
    expect(ahead.computedRadarIds).toEqual([end.postId]);
    expect(ahead.slices).toEqual([]);
    expect(viewTransferables(ahead)).toEqual([]);
    // The drop at that place: no radar left to compute, the same figures as an API that saw no ahead run.
    const drop = request(end.plan, ask);
    const release = await api.evaluate(drop);
    expect(release.computedRadarIds).toEqual([]);
    const other = createCoverageApi();
    await other.evaluate(request(plan, ask));
    const want = await other.evaluate(request(end.plan, ask));
    expect(release.partial).toBe(true);
    expect(release.slices.map((x) => x.metrics)).toEqual(want.slices.map((x) => x.metrics));
    release.slices.forEach((x, k) => {
      expect(Array.from(x.combinedPd)).toEqual(Array.from(want.slices[k].combinedPd));
      expect(Array.from(x.gap)).toEqual(Array.from(want.slices[k].gap));
    });
    // Its second step (same generation) still brings the shown slice's outlines.
    const rest = await api.evaluate({ ...drop, sliceFirst: false, shownSliceHeld: true });
    expect(rest.shownGapShapes).toBeDefined();
  });

  it("says once that a plan without a DEM stands on flat ground", async () => {
    const plan = demoPlan();
    plan.terrain.ground = { type: "flat", elevationAmslM: 312 };
    const v = await createCoverageApi().evaluate(request(plan, { dem: null }));
    const flat = v.notes.filter((n) => /No DEM/.test(n));
    expect(flat).toEqual([
      "No DEM: the ground is flat at 312 m above sea level; terrain masking comes from buildings and trees only.",
    ]);
  });
});
