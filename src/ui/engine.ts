/**
 * The planner's link to the coverage workers: one pool for the page (module workers sized to the
 * machine; size 0 inline when workers are unavailable or `?workers=0` is in the address, which tests use).
 * Accurate evaluations run on worker 0 (its per-radar cache makes a moved post cost one radar), drag
 * previews on worker 1 (its own cache of coarse, fast-masked radars, so previews never evict the
 * accurate radars and a release never waits behind a running preview), inspections on the last worker,
 * so an inspection never waits behind a run.
 */
import type { Plan } from "../io/planSchema";
import { defaultPoolSize, isStale, WorkerPool } from "../workers/pool";
import type {
  CoverageApi,
  CoverageView,
  DemPayload,
  EvaluateRequest,
  PointRequest,
} from "../workers/protocol";
import { useAssets } from "./assets";
import { useCoverage } from "./coverageState";
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
  if (view.groundAmslM.length > 0) {
    terrains[kind] = { key: view.terrainKey, ground: view.groundAmslM, obstruction: view.obstructionTopAglM };
    return view;
  }
  const t = terrains[kind];
  if (t?.key !== view.terrainKey) throw new Error("the coverage result came without its terrain");
  return { ...view, groundAmslM: t.ground, obstructionTopAglM: t.obstruction };
}

const EVAL_SLOT = 0;
const PREVIEW_SLOT = 1;
const POINT_SLOT = -1;
let generation = 0;

function demPayload(): DemPayload | null {
  const d = useAssets.getState().dem;
  return d ? { fileName: d.fileName, bytes: d.bytes } : null;
}

function errorText(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

/**
 * Runs the current plan (accurate, or fast for a drag preview); stale results are dropped. An accurate
 * run with a shown slice goes in two steps: every radar and the shown class and height first (that
 * view is drawn at once), then the other slices from the worker's cache; the run stays "running"
 * until the second step lands, so the summary of the other heights is marked as updating meanwhile.
 */
export async function runEvaluation(options: { preview?: boolean; plan?: Plan } = {}): Promise<void> {
  const plan = options.plan ?? usePlanStore.getState().plan;
  if (!plan) return;
  const g = ++generation;
  const p = await getPool();
  const kind = options.preview ? "preview" : "full";
  const focus = focusOf();
  const req: EvaluateRequest = {
    generation: g,
    plan,
    dem: demPayload(),
    ...(options.preview ? { maskMode: "fast" as const } : {}),
    perRadarPostId: singleRadarShown(),
    ...focus,
    ...(!options.preview && focus.focus ? { sliceFirst: true } : {}),
    ...(terrains[kind] ? { haveTerrainKey: terrains[kind]?.key } : {}),
  };
  useCoverage.getState().set({ running: true, generation: g });
  try {
    const slot = options.preview && p.size > 1 ? PREVIEW_SLOT : EVAL_SLOT;
    const view = withTerrain(await p.run("evaluate", g, "evaluate", [req], { slot }), kind);
    if (options.preview) {
      useCoverage.getState().set({ preview: view, running: false, problem: null });
      return;
    }
    if (!view.partial) {
      useCoverage.getState().set({ view, preview: null, running: false, problem: null });
      return;
    }
    // The shown slice is on screen; the other slices follow (a newer edit makes this step stale).
    const g2 = ++generation;
    useCoverage.getState().set({ view, preview: null, problem: null, running: true, generation: g2 });
    const rest: EvaluateRequest = {
      ...req,
      generation: g2,
      sliceFirst: false,
      gapShapesHeld: true,
      haveTerrainKey: view.terrainKey,
    };
    const all = withTerrain(await p.run("evaluate", g2, "evaluate", [rest], { slot }), kind);
    // The shown slice's gap outlines came with the first step (the same slice, the same run).
    const [shown] = view.slices;
    const again = all.slices.find((s) => s.classId === shown.classId && s.heightM === shown.heightM);
    if (again) again.gapShapes = shown.gapShapes;
    // The run's time in the worker and the radars it computed are those of both steps.
    useCoverage.getState().set({
      view: {
        ...all,
        elapsedMs: view.elapsedMs + all.elapsedMs,
        computedRadarIds: [...(view.computedRadarIds ?? []), ...(all.computedRadarIds ?? [])],
      },
      preview: null,
      running: false,
      problem: null,
    });
  } catch (e) {
    if (isStale(e)) return;
    useCoverage.getState().set({ running: false, problem: errorText(e) });
    if ((e as Error)?.name !== "WorkerCrashError")
      say("error", `The coverage could not be computed: ${errorText(e)}`);
  }
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

let pointGeneration = 0;
export async function runPoint(req: Omit<PointRequest, "generation" | "plan" | "dem">): Promise<void> {
  const plan = usePlanStore.getState().plan;
  if (!plan) return;
  const g = ++pointGeneration;
  const p = await getPool();
  useCoverage.getState().set({ pointBusy: true });
  try {
    const reply = await p.run("point", g, "point", [{ ...req, generation: g, plan, dem: demPayload() }], {
      slot: p.size > 1 ? p.size + POINT_SLOT : EVAL_SLOT,
    });
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
