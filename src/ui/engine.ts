/**
 * The planner's link to the coverage workers: one pool for the page (module workers sized to the
 * machine; size 0 inline when workers are unavailable or `?workers=0` is in the address, which tests use).
 * An accurate evaluation is split in two parts, on workers 0 and 1 (each part's slices, with a per-radar
 * cache per worker, so a moved post costs one radar on each); drag previews run on worker 1 (its own
 * cache of coarse, fast-masked radars, so previews never evict the accurate radars); inspections on
 * the last worker. With one worker, everything runs there in one part.
 */

import * as Comlink from "comlink";
import { errorText } from "../io/importErrors";
import type { Plan } from "../io/planSchema";
import { RUN_PARTS } from "../io/siteGrid";
import { planToWire } from "../workers/planWire";
import { defaultPoolSize, isStale, WorkerPool } from "../workers/pool";
import type {
  CoverageApi,
  CoverageView,
  DemPayload,
  EvaluateRequest,
  PointRequest,
  ProgressListener,
} from "../workers/protocol";
import { type DemAsset, useAssets } from "./assets";
import { useCoverage } from "./coverageState";
import { previewLanded, takeRecyclable } from "./previewMemory";
import { mergePartViews, RunProgressTracker, unique } from "./runParts";
import { selectedSlice } from "./selection";
import { say, useSession } from "./session";
import { usePlanStore } from "./store";

let pool: WorkerPool<CoverageApi> | null = null;

function poolSize(): number {
  if (typeof Worker === "undefined") return 0;
  const q = new URLSearchParams(globalThis.location?.search ?? "").get("workers");
  if (q !== null && Number.isFinite(Number(q))) return Math.max(0, Math.floor(Number(q)));
  return defaultPoolSize();
}

export async function getPool(): Promise<WorkerPool<CoverageApi>> {
  if (pool) return pool;
  const size = poolSize();
  if (size === 0) {
    const { createCoverageApi } = await import("../workers/coverageApi");
    pool = new WorkerPool<CoverageApi>({ size: 0, inline: createCoverageApi() });
  } else {
    pool = new WorkerPool<CoverageApi>({
      size,
      createWorker: () =>
        new Worker(new URL("../workers/coverage.worker.ts", import.meta.url), { type: "module" }),
      onSuperseded: (remote, _channel, g) => void remote.supersede(g).catch(() => undefined),
      onCrash: (message) => {
        // The new worker holds no DEM yet (withDem would find out, at the cost of one refused request).
        demHeld.clear();
        say("error", message);
        // The plan is intact; run it again on the new worker.
        scheduleEvaluation();
      },
    });
  }
  return pool;
}

interface TerrainArrays {
  key: string;
  ground: Float32Array;
  obstruction: Float32Array;
}

/**
 * The terrain arrays last received, for full runs and for previews apart (a preview of a large site
 * runs on a coarser grid), so that views of the same terrain need not carry them again.
 */
const terrains: { full: TerrainArrays | null; preview: TerrainArrays | null } = { full: null, preview: null };

function withTerrain(view: CoverageView, kind: "full" | "preview"): CoverageView {
  const t = terrains[kind];
  // The arrays held for this terrain are kept even when a view brings them again (both parts of a
  // first run do): the layers drawn from them (the hillshade) see the same arrays and stay as they are.
  if (t?.key === view.terrainKey)
    return { ...view, groundAmslM: t.ground, obstructionTopAglM: t.obstruction };
  if (view.groundAmslM.length === 0) throw new Error("the coverage result came without its terrain");
  terrains[kind] = { key: view.terrainKey, ground: view.groundAmslM, obstruction: view.obstructionTopAglM };
  return view;
}

/** The buffers of the terrain arrays the page holds (never handed back to a worker). */
function terrainBuffers(): ArrayBufferLike[] {
  return [terrains.full, terrains.preview].flatMap((t) => (t ? [t.ground.buffer, t.obstruction.buffer] : []));
}

const EVAL_SLOT = 0;
const PREVIEW_SLOT = 1;
/** An accurate run is split over at most this many workers (one part each; the memory estimate counts them). */
const ACCURATE_PARTS = RUN_PARTS;
const POINT_SLOT = -1;

/** The pool channel of a worker's evaluations: a newer one there supersedes an older one. */
function evaluateChannel(slot: number): string {
  return `evaluate-${slot}`;
}
let generation = 0;

/** An id per DEM the page holds (DemPayload.id): a new file of the same name and size is a new DEM. */
const demIds = new WeakMap<DemAsset, string>();
let demCount = 0;

function demPayload(): (DemPayload & { id: string }) | null {
  const d = useAssets.getState().dem;
  if (!d) return null;
  let id = demIds.get(d);
  if (id === undefined) {
    id = `dem-${++demCount}`;
    demIds.set(d, id);
  }
  return { fileName: d.fileName, bytes: d.bytes, id };
}

/** The DEM id each worker (by its index in the pool) has received with the DEM's bytes. */
const demHeld = new Map<number, string>();

/**
 * Sends a request that carries the DEM to the worker of `slot`: its bytes only when that worker has
 * not had this DEM yet (a 1.4 MB copy per message otherwise, in the task of the release), and again
 * if the worker turns out not to hold it (replaced after a crash).
 */
export async function withDem<T>(
  p: WorkerPool<CoverageApi>,
  slot: number,
  send: (dem: DemPayload | null) => Promise<T>,
): Promise<T> {
  const full = demPayload();
  if (full === null) return send(null);
  const index = p.size > 0 ? slot % p.size : 0;
  const attempt = async (dem: DemPayload): Promise<T> => {
    const r = await send(dem);
    demHeld.set(index, full.id);
    return r;
  };
  if (demHeld.get(index) !== full.id) return attempt(full);
  try {
    return await attempt({ fileName: full.fileName, id: full.id });
  } catch (e) {
    if ((e as Error)?.name !== "DemMissingError") throw e;
    demHeld.delete(index);
    return attempt(full);
  }
}

/**
 * One part of an accurate run on the worker of `slot`, in two steps when the part holds the shown
 * slice: every radar of the part and the shown slice first (`onShown` draws it at once), then the
 * part's other slices from the worker's cache. Resolves to the whole part.
 */
async function runPart(
  p: WorkerPool<CoverageApi>,
  req: EvaluateRequest,
  slot: number,
  onShown: (view: CoverageView) => void,
  onProgress: ProgressListener,
): Promise<CoverageView> {
  const channel = evaluateChannel(slot);
  // Marked once for comlink; each call that takes it gets a channel of its own, closed by the worker.
  const listener = Comlink.proxy(onProgress);
  const view = withTerrain(
    await withDem(p, slot, (dem) =>
      p.run(channel, req.generation, "evaluate", [{ ...req, dem }, listener], { slot }),
    ),
    "full",
  );
  if (!view.partial) return view;
  const rest: EvaluateRequest = {
    ...req,
    sliceFirst: false,
    shownSliceHeld: true,
    haveTerrainKey: view.terrainKey,
  };
  // The second step is asked for before the shown slice is drawn: drawing it takes the page 10–30 ms
  // at 1 M cells, which the worker would otherwise wait through.
  const second = withDem(p, slot, (dem) =>
    p.run(channel, req.generation, "evaluate", [{ ...rest, dem }, listener], { slot }),
  );
  onShown(view);
  const all = withTerrain(await second, "full");
  // The second step fused the part's other slices only: the shown one is the first step's, with the
  // gap outlines the second step brought.
  const shown = view.slices.map((s) => ({ ...s, gapShapes: all.shownGapShapes }));
  return {
    ...all,
    // One of the two steps merged the lowest visible height (EvaluateRequest.lowestShown).
    lowestVisibleAglM: all.lowestVisibleAglM.length > 0 ? all.lowestVisibleAglM : view.lowestVisibleAglM,
    shownGapShapes: undefined,
    slices: [...shown, ...all.slices],
    elapsedMs: view.elapsedMs + all.elapsedMs,
    computedRadarIds: unique([view.computedRadarIds, all.computedRadarIds]),
  };
}

/** The request of a run of `plan` as generation `g`: a drag preview, or an accurate run (its part 0 first). */
function evaluateRequest(plan: Plan, g: number, preview: boolean): EvaluateRequest {
  const kind = preview ? "preview" : "full";
  const focus = focusOf();
  const lowestShown = useSession.getState().layer === "lowest";
  return {
    generation: g,
    ...planToWire(plan),
    // Each send puts in the DEM as that worker needs it (withDem).
    dem: null,
    ...(preview ? { maskMode: "fast" as const } : {}),
    perRadarPostId: singleRadarShown(),
    ...focus,
    ...(!preview && focus.focus ? { sliceFirst: true } : {}),
    lowestShown,
    skipLowest: !lowestShown,
    ...(terrains[kind] ? { haveTerrainKey: terrains[kind]?.key } : {}),
  };
}

/** Part `k` of `count` of an accurate run's request (the request itself when the run is one part). */
function partOf(req: EvaluateRequest, k: number, count: number): EvaluateRequest {
  return count > 1 ? { ...req, part: { index: k, count } } : req;
}

/** Parts of an accurate run of `plan` on pool `p`. */
function partCount(p: WorkerPool<CoverageApi>, plan: Plan): number {
  return Math.max(1, Math.min(p.size, ACCURATE_PARTS, sliceCount(plan)));
}

/**
 * Above this many cells the preview worker computes no part ahead: one radar there takes about 100 ms
 * per million cells in a browser worker, which a move after the rest would wait for.
 */
const AHEAD_ON_PREVIEW_WORKER_MAX_CELLS = 2_000_000;
/** The pointer rests this long on a dragged post before its release is computed ahead. */
const RELEASE_AHEAD_AFTER_MS = 80;
let releaseAhead: ReturnType<typeof setTimeout> | null = null;

/**
 * While a dragged post rests, begins the accurate run its release would start, each part on its
 * worker, so that the moved radar's masking and stage are in the workers' caches and the slices'
 * fusion in their memos when the post is dropped there (the replies, without arrays, are dropped).
 * `dropped`: the plan as a drop there would make it (asked for only once the pointer rests). A newer
 * move, the release or another run cancels what has not started.
 */
export function computeReleaseAhead(dropped: () => Plan | null): void {
  if (releaseAhead) clearTimeout(releaseAhead);
  releaseAhead = setTimeout(() => {
    releaseAhead = null;
    const p = pool;
    // With one worker, the previews and the release share it: nothing to gain.
    const plan = p && p.size >= 2 ? dropped() : null;
    if (!p || !plan) return;
    const g = ++generation;
    const req = evaluateRequest(plan, g, false);
    const count = partCount(p, plan);
    // Every part, each on the worker its release runs it on (part k on worker k). Worker 1 also runs
    // the previews: the pointer rests, so none is waiting, and a new move supersedes this run there,
    // but only once the radar it is computing is done; on a large grid that would hold the next
    // preview too long, so there only part 0 (on worker 0, idle during a drag) goes ahead.
    const f = useCoverage.getState().view?.frame;
    const parts = f && f.width * f.height > AHEAD_ON_PREVIEW_WORKER_MAX_CELLS ? 1 : count;
    for (let k = 0; k < parts; k++) sendCacheOnly(p, k, partOf(req, k, count));
  }, RELEASE_AHEAD_AFTER_MS);
}

/**
 * Sends `req` as a `cacheOnly` run to the worker of `slot`: it computes and keeps (cache, fusion memo);
 * its reply, without arrays, and any failure (a newer run superseding it) are dropped.
 */
function sendCacheOnly(p: WorkerPool<CoverageApi>, slot: number, req: EvaluateRequest): void {
  const run: EvaluateRequest = { ...req, cacheOnly: true };
  void withDem(p, slot, (dem) =>
    p.run(evaluateChannel(slot), run.generation, "evaluate", [{ ...run, dem }], { slot }),
  ).catch(() => undefined);
}

/**
 * After an accurate run has landed, the preview worker computes the drag preview of the plan as it
 * stands (fast masking, the shown slice) without replying arrays (`cacheOnly`): its radars stay in that
 * worker's cache and the fusion in its memo, so the first preview of the next drag computes only the
 * moved radar instead of every radar of the preview grid. After a drag the preview of the drop is
 * cached already, and this costs next to nothing.
 */
function warmPreviews(p: WorkerPool<CoverageApi>, plan: Plan): void {
  if (p.size < 2) return;
  sendCacheOnly(p, PREVIEW_SLOT, evaluateRequest(plan, ++generation, true));
}

function cancelReleaseAhead(): void {
  if (releaseAhead) clearTimeout(releaseAhead);
  releaseAhead = null;
}

/**
 * Runs the current plan (accurate, or fast for a drag preview); stale results are dropped. With two
 * workers or more, an accurate run is split into one part per worker (each computes every radar's
 * masking and the SNR and Pd of its own slices, and fuses them), so a release uses every core. The
 * part holding the shown slice gives it first (drawn at once); the run stays "running" until every
 * part has landed, so the summary of the other slices is marked as updating meanwhile.
 */
export async function runEvaluation(options: { preview?: boolean; plan?: Plan } = {}): Promise<void> {
  const plan = options.plan ?? usePlanStore.getState().plan;
  if (!plan) return;
  if (!options.preview) cancelReleaseAhead();
  const g = ++generation;
  // No await when the pool exists: a run started from an input handler posts to the workers in that
  // same task, before the page renders the change (evaluateScheduledNow).
  const p = pool ?? (await getPool());
  const kind = options.preview ? "preview" : "full";
  const req = evaluateRequest(plan, g, options.preview === true);
  useCoverage.getState().set({ running: true, generation: g });
  try {
    if (options.preview) {
      const slot = p.size > 1 ? PREVIEW_SLOT : EVAL_SLOT;
      // Only to a worker: inline (no pool) the arrays would be the ones just handed back.
      const recycled = p.size > 0 ? takeRecyclable() : [];
      let sent = false;
      const view = withTerrain(
        await withDem(p, slot, (dem) => {
          // A retry (the DEM again) goes without them: the first message moved them already.
          const mine = sent ? [] : recycled;
          sent = true;
          return p.run(evaluateChannel(slot), g, "evaluate", [{ ...req, dem, recycled: mine }], {
            slot,
            transfer: mine.map((a) => a.buffer as ArrayBuffer),
          });
        }),
        kind,
      );
      previewLanded(view, terrainBuffers());
      useCoverage.getState().set({ preview: view, running: false, problem: null });
      return;
    }
    const count = partCount(p, plan);
    const showShown = (view: CoverageView) => {
      if (g === generation) useCoverage.getState().set({ view, preview: null, problem: null, running: true });
    };
    const progress = new RunProgressTracker(count, (fraction) => {
      if (g === generation) useCoverage.getState().set({ progress: fraction });
    });
    const parts = await Promise.all(
      Array.from({ length: count }, async (_, k) => {
        const part = partOf(req, k, count);
        const view = await runPart(p, part, k, showShown, (r) => progress.report(k, r));
        progress.finish(k);
        return view;
      }),
    );
    if (g !== generation) return;
    useCoverage
      .getState()
      .set({ view: mergePartViews(parts), preview: null, running: false, progress: null, problem: null });
    // Every part has landed: the workers may prepare memory for the next release.
    p.notifyAll((api) => api.settled());
    warmPreviews(p, plan);
  } catch (e) {
    if (isStale(e)) return;
    useCoverage.getState().set({ running: false, progress: null, problem: errorText(e) });
    if ((e as Error)?.name !== "WorkerCrashError")
      say("error", `The coverage could not be computed: ${errorText(e)}`);
  }
}

/** Slices (class, height) a run of the plan fuses: a part with none would only repeat the masking. */
function sliceCount(plan: Plan): number {
  const heights = new Set(plan.analysis.targetHeightsM);
  return plan.targetClasses.reduce((n, t) => n + t.heightsAglM.filter((h) => heights.has(h)).length, 0);
}

/** The class and height the map shows. */
function focusOf(): { focus?: { classId: string; heightM: number } } {
  const s = useSession.getState();
  const view = useCoverage.getState().view;
  const slice = selectedSlice(view, s.classId, s.heightM);
  return slice ? { focus: { classId: slice.classId, heightM: slice.heightM } } : {};
}

/** The post whose own Pd the map shows (null unless the single-radar layer is on). */
function singleRadarShown(): string | null {
  const s = useSession.getState();
  if (s.layer !== "single") return null;
  const plan = usePlanStore.getState().plan;
  return s.singlePostId ?? plan?.posts.find((p) => p.enabled)?.id ?? null;
}

let pending: ReturnType<typeof setTimeout> | null = null;
/** Coalesces a burst of changes into one run on the next task. */
export function scheduleEvaluation(): void {
  if (pending) clearTimeout(pending);
  pending = setTimeout(() => {
    pending = null;
    void runEvaluation();
  }, 0);
}

/**
 * Starts the evaluation scheduled by the change just made, in this task: for a change the user
 * releases (a dragged post), so that the workers start before the page re-renders and repaints the
 * change (about 20 ms at 1 M cells) instead of after it. No-op when none is scheduled.
 */
export function evaluateScheduledNow(): void {
  if (!pending) return;
  clearTimeout(pending);
  pending = null;
  void runEvaluation();
}

let pointGeneration = 0;
export async function runPoint(req: Omit<PointRequest, "generation" | "plan" | "dem">): Promise<void> {
  const plan = usePlanStore.getState().plan;
  if (!plan) return;
  const g = ++pointGeneration;
  const p = await getPool();
  useCoverage.getState().set({ pointBusy: true });
  try {
    const slot = p.size > 1 ? p.size + POINT_SLOT : EVAL_SLOT;
    const reply = await withDem(p, slot, (dem) =>
      p.run("point", g, "point", [{ ...req, generation: g, plan, dem }], { slot }),
    );
    useCoverage.getState().set({ point: reply, pointBusy: false });
  } catch (e) {
    if (isStale(e)) return;
    useCoverage.getState().set({ pointBusy: false });
    say("error", `The point could not be inspected: ${errorText(e)}`);
  }
}

/** Test hook: crash the evaluation worker on purpose. */
export async function crashWorkerForTest(): Promise<void> {
  const p = await getPool();
  await p.run("crash", 1, "crashForTest", [], { slot: EVAL_SLOT }).catch(() => undefined);
}
