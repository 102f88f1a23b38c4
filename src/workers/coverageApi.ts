/**
 * The coverage API as it runs inside a worker (or inline with pool size 0): checks the request, prepares
 * the site (src/io/preparePlan.ts, cached while terrain and grid stay the same), and calls the engine
 * (src/coverage/evaluate.ts) with a per-radar cache, so moving one post recomputes one radar.
 */
import { blankRadarCoverage, type PlacedRadar, type RadarCoverage } from "../coverage/coverage";
import {
  CancelledError,
  computeRadarCoverage,
  evaluatePoint,
  evaluateSite,
  type PreparedSite,
  radarGroup,
  radarKey,
  type SiteResult,
  siteTerrainId,
  yieldToEventLoop,
} from "../coverage/evaluate";
import { FusionMemo } from "../coverage/fusionMemo";
import type { GridFrame } from "../coverage/grid";
import { linkBudget } from "../coverage/linkBudget";
import { RadarResultCache } from "../coverage/radarCache";
import type { Plan } from "../io/planSchema";
import { parsePlan } from "../io/planValidation";
import { preparePlan } from "../io/preparePlan";
import {
  KEPT_RESULTS_PER_POST,
  PREVIEW_MAX_CELLS,
  RADAR_HEIGHT_BYTES_PER_CELL,
  RADAR_PART_BYTES_PER_CELL,
  RADAR_SLICE_BYTES_PER_CELL,
  type SiteGrid,
  SPARE_RADAR_RESULTS,
  siteGridFrame,
} from "../io/siteGrid";
import { type GapShapesXY, gapShapesXY } from "./gapContours";
import { azimuthAndDistanceXY } from "./geometry";
import { planFromWire } from "./planWire";
import { planKeyWithoutPlacement, previewSite } from "./preview";
import { terrainProfile } from "./profile";
import { throttleProgress } from "./progressThrottle";
import type {
  CoverageApi,
  CoverageView,
  DemPayload,
  EvaluateRequest,
  PointRadar,
  PointReply,
  PointRequest,
  ProgressListener,
} from "./protocol";
import { focusKey, focusSite, mergesLowest, narrowRadar, partSite, releaseStepSite } from "./siteSlices";
import { cloneView, toCoverageView } from "./toView";
import { newBuffer, WarmBuffers, writeThrough } from "./warmBuffers";

/** Per-radar results kept (two mask modes × a few edits of each radar). */
const RADAR_CACHE_ENTRIES = 64;
/**
 * Memory is prepared while idle only for grids up to this many cells: on larger grids the faults are
 * a smaller share of a release. (The run's memory estimate, siteGrid.ts, counts the ready copies on
 * every grid.)
 */
const WARM_MAX_CELLS = 4_000_000;
/** Pause between two arrays the idle work writes, ms (writeThrough in warmBuffers.ts says why). */
const IDLE_PAUSE_MS = 25;

function newCache(entries: number): RadarResultCache<RadarCoverage> {
  // Per post and mask mode the newest and two earlier results (siteGrid.ts, where the run's memory
  // estimate counts them); older ones leave the cache and their arrays are written over by the next
  // radar computed (two kept as spares), which saves faulting in new memory on each release.
  return new RadarResultCache<RadarCoverage>(entries, {
    perGroup: KEPT_RESULTS_PER_POST,
    spares: SPARE_RADAR_RESULTS,
  });
}

function now(): number {
  return performance.now();
}

/** A request whose plan does not validate: the message names the fields. */
export class BadRequestError extends Error {
  override name = "BadRequestError";
}

/** A request named a DEM by its id alone and this worker holds no DEM of that id (a new worker). */
export class DemMissingError extends Error {
  override name = "DemMissingError";
}

/** A DEM with its bytes, as a worker holds it. */
type HeldDem = DemPayload & { bytes: ArrayBuffer };

/** Memory the per-radar cache may hold, bytes (entries are sized from the grid). */
export const RADAR_CACHE_BUDGET_BYTES = 768 * 1024 * 1024;

interface PreparedSlot {
  key: string;
  placementFreeKey: string;
  site: PreparedSite;
  warnings: string[];
  grid: SiteGrid;
}

function postName(plan: Plan, id: string): string {
  return plan.posts.find((p) => p.id === id)?.name ?? id;
}

/** The plan on a coarser grid for previews of a large site, or null when the grid is small enough. */
function coarsePlanOf(plan: Plan): Plan | null {
  const g = siteGridFrame(plan);
  if (g.cellCount <= PREVIEW_MAX_CELLS) return null;
  const factor = Math.sqrt(g.cellCount / PREVIEW_MAX_CELLS);
  const cellSizeM = Math.ceil(g.frame.cellSizeM * factor * 100) / 100;
  return { ...plan, analysis: { ...plan.analysis, cellSizeM } };
}

function cacheEntriesFor(site: PreparedSite): number {
  const cells = site.frame.width * site.frame.height;
  const h = site.heightsAglM.length;
  const perEntry =
    cells *
    (RADAR_PART_BYTES_PER_CELL +
      h * (RADAR_HEIGHT_BYTES_PER_CELL + site.targets.length * RADAR_SLICE_BYTES_PER_CELL));
  // The spares (results that left the cache, one prepared while idle) share the budget.
  const fit = Math.floor(RADAR_CACHE_BUDGET_BYTES / Math.max(1, perEntry)) - SPARE_RADAR_RESULTS;
  return Math.max(site.radars.length + KEPT_RESULTS_PER_POST - 1, Math.min(RADAR_CACHE_ENTRIES, fit));
}

/** Gap shapes with their own ring arrays. */
function copyShapes(s: GapShapesXY): GapShapesXY {
  return {
    outlines: s.outlines.map((o) => ({ ...o, rings: o.rings.map((r) => r.slice()) })),
    labels: s.labels.map((l) => ({ ...l })),
  };
}

/** The memo's identity of a slice's gap raster (FusionMemo gapVersion, by mask mode), if it has one. */
function gapVersionOf(
  result: SiteResult,
  slice: { classId: string; heightM: number },
  mode: "accurate" | "fast",
): string | undefined {
  const h = result.targets
    .find((t) => t.targetId === slice.classId)
    ?.heights.find((x) => x.heightAglM === slice.heightM);
  return h?.gapVersion === undefined ? undefined : `${mode}:${h.gapVersion}`;
}

export interface CoverageApiOptions {
  /**
   * Prepare memory for the next run while idle (warmBuffers.ts): a spare radar result and the copies
   * of the fused slices a view sends. The worker entry turns it on; inline runs and tests need not.
   */
  warmWhenIdle?: boolean;
}

/** What createCoverageApi gives besides the API: for the worker entry and for tests. */
export interface CoverageApiInternals {
  lastSite(): PreparedSite | null;
  /** Resolves once the idle work started by the last `settled()` is done (or stopped by a new run). */
  whenIdle(): Promise<void>;
  /** Spare radar results of the accurate cache and ready arrays like `like`, for tests. */
  readyCounts(like: Float32Array): { spareRadars: number; arrays: number };
}

export function createCoverageApi(options: CoverageApiOptions = {}): CoverageApi & CoverageApiInternals {
  let cache = newCache(RADAR_CACHE_ENTRIES);
  /**
   * Drag previews (fast masking, often a coarser grid) keep their own cache: every drag step stores a
   * new entry for the moved radar, which would otherwise push the accurate radars out and make the
   * release recompute all of them.
   */
  let fastCache = newCache(RADAR_CACHE_ENTRIES);
  const fastCacheFor = (site: PreparedSite): RadarResultCache<RadarCoverage> => {
    const entries = cacheEntriesFor(site);
    if (entries !== fastCache.maxEntries) fastCache = newCache(entries);
    return fastCache;
  };
  /**
   * The last fused slices of accurate runs and of previews apart (a preview may run on a coarser
   * grid): a release after a drag fuses again only where the moved radar's squares lie.
   */
  const accurateMemo = new FusionMemo();
  const fastMemo = new FusionMemo();
  /** The full-resolution site of the last run, and the coarse one of the last preview of a large site. */
  let prepared: PreparedSlot | null = null;
  let coarse: PreparedSlot | null = null;

  const parse = (planInput: unknown) => {
    const parsed = parsePlan(planInput);
    if (!parsed.ok) throw new BadRequestError(parsed.errors.map((e) => `${e.path}: ${e.message}`).join("; "));
    return parsed.plan;
  };

  const prepareSlot = async (
    plan: Plan,
    dem: HeldDem | null,
    slot: PreparedSlot | null,
    preview: boolean,
  ): Promise<{ slot: PreparedSlot; site: PreparedSite }> => {
    const demKey = dem?.id ?? [dem?.fileName ?? null, dem?.bytes.byteLength ?? 0];
    const key = JSON.stringify([plan, demKey]);
    const placementFreeKey = JSON.stringify([planKeyWithoutPlacement(plan), demKey]);
    if (slot?.key === key) return { slot, site: slot.site };
    if (slot && placementFreeKey === slot.placementFreeKey) {
      // Only posts moved or turned: place them again on the prepared terrain (roof posts: previews only).
      const quick = previewSite(plan, slot, preview);
      if (quick) {
        const stale = (w: string) => quick.movedIds.some((id) => w.includes(`(${postName(plan, id)})`));
        const site: PreparedSite = {
          ...quick.site,
          warnings: [...quick.site.warnings.filter((w) => !stale(w)), ...quick.warnings],
        };
        const warnings = [...slot.warnings.filter((w) => !stale(w)), ...quick.warnings];
        return { slot: preview ? slot : { key, placementFreeKey, site, warnings, grid: slot.grid }, site };
      }
    }
    const p = await preparePlan(plan, dem ? { fileName: dem.fileName, data: dem.bytes } : undefined);
    const site: PreparedSite = { ...p.site, terrainId: siteTerrainId(p.site) };
    return { slot: { key, placementFreeKey, site, warnings: p.warnings, grid: p.grid }, site };
  };

  /** The DEM last received with its bytes; requests that name it by id alone use it. */
  let heldDem: HeldDem | null = null;
  const demOf = (dem: DemPayload | null | undefined): HeldDem | null => {
    if (!dem) return null;
    if (dem.bytes !== undefined) {
      heldDem = dem as HeldDem;
      return heldDem;
    }
    if (dem.id !== undefined && heldDem?.id === dem.id) return heldDem;
    throw new DemMissingError(`this worker does not hold the DEM ${dem.fileName} (${dem.id ?? "no id"})`);
  };

  const prepare = async (
    planInput: unknown,
    dem: HeldDem | null,
    maskMode?: "accurate" | "fast",
  ): Promise<PreparedSite> => {
    const plan = parse(planInput);
    if (maskMode === "fast") {
      const coarsePlan = coarsePlanOf(plan);
      if (coarsePlan) {
        const r = await prepareSlot(coarsePlan, dem, coarse, true);
        coarse = r.slot;
        return { ...r.site, maskMode };
      }
    }
    const r = await prepareSlot(plan, dem, prepared, maskMode === "fast");
    if (r.slot !== prepared) {
      prepared = r.slot;
      const entries = cacheEntriesFor(r.site);
      if (entries !== cache.maxEntries) cache = newCache(entries);
    }
    return maskMode ? { ...r.site, maskMode } : r.site;
  };

  /** The gaps of the slice a first step gave, for its outlines in the second step. */
  let shownGap: { generation: number; focus: string; gap: Uint8Array; version?: string } | null = null;
  /** The gap outlines last found, by slice and gap version (the same gap cells: the same outlines). */
  let lastOutlines: { key: string; shapes: GapShapesXY } | null = null;
  const outlinesOf = (gap: Uint8Array, frame: GridFrame, focus: string, version?: string): GapShapesXY => {
    const key = version === undefined ? null : `${focus}|${version}|${JSON.stringify(frame)}`;
    // A copy goes out each time: the rings' buffers move with the view (transferred, then detached).
    if (key !== null && lastOutlines?.key === key) return copyShapes(lastOutlines.shapes);
    const shapes = gapShapesXY(gap, frame);
    if (key !== null) lastOutlines = { key, shapes: copyShapes(shapes) };
    return shapes;
  };

  /** The newest generation this worker was told of; older runs stop at their next check. */
  let newest = 0;

  /**
   * Accurate runs in progress, and the idle work last started. Idle work stops for these only: a
   * drag's previews (fast masking) run between its arrays, so that the memory is ready when the drag
   * ends however soon it ends.
   */
  let runningAccurate = 0;
  let idleWork: Promise<void> = Promise.resolve();
  /** The site of the last accurate run, whose shapes the idle work prepares once the page settles. */
  let lastAccurate: PreparedSite | null = null;
  const warm = new WarmBuffers();
  /** Arrays of spent previews, moved back by the page (EvaluateRequest.recycled), for the next previews. */
  const spare = new WarmBuffers();

  /**
   * After an accurate run of `site` (a whole site or a part): a spare radar result of its shape and
   * ready copies of its fused slices, so that the next release writes into memory already faulted in.
   */
  const prepareWhileIdle = async (site: PreparedSite): Promise<void> => {
    const stop = () => runningAccurate > 0;
    const n = site.frame.width * site.frame.height;
    if (n > WARM_MAX_CELLS) return;
    if (cache.spareCount === 0 && site.radars.length > 0) {
      const target = cache;
      const blank = blankRadarCoverage({ ...site, radar: site.radars[0] });
      const arrays = [
        blank.lowestVisibleHeightAglM,
        ...blank.heights.flatMap((h) => [
          h.snrDbAt0Dbsm,
          ...h.targets.flatMap((t) => (t.pd && t.reason ? [t.pd, t.reason] : [])),
        ]),
      ];
      if (await writeThrough(arrays, stop, IDLE_PAUSE_MS)) target.addSpare(blank);
      else return;
    }
    const slices = site.targets.reduce((k, t) => k + t.heightsAglM.length, 0);
    // A Float32 copy per slice and one for the lowest visible height; two bytes per slice.
    for (const [kind, want] of [
      ["f32", slices + 1],
      ["u8", 2 * slices],
    ] as const) {
      while (warm.count(kind, n) < Math.min(want, warm.maxPerKind)) {
        const a = newBuffer(kind, n);
        if (!(await writeThrough([a], stop, IDLE_PAUSE_MS))) return;
        warm.put(a);
      }
    }
  };

  /** One evaluation (see evaluate); `onSite` hears the site it evaluated. */
  const evaluateRun = async (
    req: EvaluateRequest,
    onProgress: ProgressListener | undefined,
    onSite: (site: PreparedSite) => void,
  ): Promise<CoverageView> => {
    const t0 = now();
    const stale = () => req.generation < newest;
    const whole = await prepare(planFromWire(req), demOf(req.dem), req.maskMode);
    const full = req.part && whole.maskMode !== "fast" ? partSite(whole, req.part) : whole;
    onSite(full);
    let site = req.maskMode === "fast" && req.focus ? focusSite(full, req.focus) : full;
    let result: SiteResult;
    // An accurate run with a focus goes in two steps: the shown slice first, then (shownSliceHeld)
    // the other slices; both take every radar of the full site from the cache, computed once.
    const sub = site.maskMode === "fast" || !req.focus ? full : releaseStepSite(full, req.focus, req);
    // See EvaluateRequest.lowestShown: which step of a run merges the lowest visible height.
    const lowestVisible =
      req.skipLowest !== true &&
      (whole.maskMode === "fast" || sub === full
        ? mergesLowest(whole, { ...req, sliceFirst: false, shownSliceHeld: false })
        : mergesLowest(whole, req));
    if (sub !== full) {
      const mode = full.maskMode;
      const terrainId = siteTerrainId(full);
      const computed: string[] = [];
      const accurate = cache;
      const radarKeys = full.radars.map((_, i) => radarKey(full, i, mode, terrainId));
      result = await evaluateSite(sub, {
        mode,
        lowestVisible,
        onProgress,
        shouldCancel: stale,
        fusionMemo: accurateMemo,
        radarKeys,
        runRadar: async (_s, i) => {
          const key = radarKeys[i];
          let r = accurate.get(key);
          if (r === undefined) {
            // A turn of the event loop before computing a radar, so that a newer generation can be
            // heard (a radar from the cache takes no time and needs none).
            await yieldToEventLoop();
            if (stale()) throw new CancelledError();
            r = computeRadarCoverage(full, i, mode, accurate.takeSpare());
            accurate.computed++;
            if (req.cacheOnly) accurate.setAhead(key, r, radarGroup(full.radars[i], mode));
            else accurate.set(key, r, radarGroup(full.radars[i], mode));
            computed.push(full.radars[i].id);
          } else accurate.hits++;
          return narrowRadar(r, full, sub);
        },
      });
      result = {
        ...result,
        computedRadarIds: computed,
        cachedRadarIds: full.radars.map((r) => r.id).filter((id) => !computed.includes(id)),
      };
      site = sub;
    } else {
      result = await evaluateSite(site, {
        cache: site.maskMode === "fast" ? fastCacheFor(site) : cache,
        fusionMemo: site.maskMode === "fast" ? fastMemo : accurateMemo,
        mode: site.maskMode,
        lowestVisible,
        onProgress,
        shouldCancel: stale,
        cacheAhead: req.cacheOnly === true,
      });
    }
    const notes = [...new Set([...site.warnings, ...(prepared?.warnings ?? [])])];
    if (site.frame.cellSizeM !== prepared?.site.frame.cellSizeM) {
      notes.unshift(`Preview on ${site.frame.cellSizeM} m cells; the full grid follows on release.`);
    }
    const terrainKey = site.terrainId ?? siteTerrainId(site);
    const made = toCoverageView(site, result, {
      generation: req.generation,
      notes,
      elapsedMs: now() - t0,
      terrainKey,
      withTerrain: !req.cacheOnly && terrainKey !== req.haveTerrainKey,
      perRadarPostId: req.perRadarPostId ?? null,
    });
    // Computed ahead: what was computed, with none of the arrays (they are the worker's own and a
    // reply's arrays are transferred away).
    if (req.cacheOnly) return { ...made, lowestVisibleAglM: new Float32Array(0), slices: [] };
    const view = cloneView(
      made,
      // A preview copies into the memory of spent previews: the ready arrays are kept for the release.
      (a) => (site.maskMode === "fast" ? spare.copy(a) : warm.copy(a)),
    );
    if (req.sliceFirst && sub !== full) view.partial = true;
    if (full !== whole) {
      // A part: the whole run's heights and classes, so the parts can be put together.
      view.heightsM = [...whole.heightsAglM];
      view.classIds = whole.targets.map((t) => t.id);
    }
    const focused = view.slices.find(
      (s) => s.classId === req.focus?.classId && s.heightM === req.focus?.heightM,
    );
    const version = focused ? gapVersionOf(result, focused, site.maskMode) : undefined;
    if (view.partial && focused) {
      // The shown slice goes at once; its gap outlines come with the next step (from a copy, as
      // the slice's arrays move to the caller).
      shownGap = { generation: req.generation, focus: focusKey(focused), gap: focused.gap.slice(), version };
    } else if (req.shownSliceHeld && req.focus) {
      if (shownGap?.generation === req.generation && shownGap.focus === focusKey(req.focus))
        view.shownGapShapes = outlinesOf(shownGap.gap, view.frame, shownGap.focus, shownGap.version);
      shownGap = null;
    } else if (focused && (site.maskMode !== "fast" || !req.focus)) {
      focused.gapShapes = outlinesOf(focused.gap, view.frame, focusKey(focused), version);
    }
    return view;
  };

  return {
    lastSite: () => prepared?.site ?? null,
    whenIdle: () => idleWork,
    readyCounts: (like) => ({
      spareRadars: cache.spareCount,
      arrays: warm.count(like instanceof Float32Array ? "f32" : "u8", like.length),
    }),
    async supersede(generation: number) {
      newest = Math.max(newest, generation);
    },
    async evaluate(req: EvaluateRequest, onProgress?: ProgressListener): Promise<CoverageView> {
      const accurate = req.maskMode !== "fast";
      for (const a of req.recycled ?? []) spare.put(a);
      if (accurate) runningAccurate++;
      let site: PreparedSite | null = null;
      try {
        const view = await evaluateRun(req, throttleProgress(onProgress), (s) => {
          site = s;
        });
        return view;
      } finally {
        if (accurate) runningAccurate--;
        const done = site as PreparedSite | null;
        if (done !== null && done.maskMode !== "fast") lastAccurate = done;
      }
    },
    async settled() {
      const done = lastAccurate;
      if (!options.warmWhenIdle || runningAccurate > 0 || done === null) return;
      const previous = idleWork;
      idleWork = previous.then(() => (runningAccurate === 0 ? prepareWhileIdle(done) : undefined));
    },
    async point(req: PointRequest): Promise<PointReply> {
      if (!(Number.isFinite(req.lonDeg) && Number.isFinite(req.latDeg)))
        throw new BadRequestError("point: lon/lat must be numbers");
      if (!(Number.isFinite(req.heightM) && req.heightM >= 0))
        throw new BadRequestError(`heightM: ${req.heightM} must be ≥ 0 m`);
      const site = await prepare(req.plan, demOf(req.dem));
      const grid = prepared?.grid;
      if (!grid) throw new BadRequestError("the site could not be prepared");
      const [x, y] = grid.toGrid(req.lonDeg, req.latDeg);
      const r = evaluatePoint(site, { x, y }, req.heightM);
      const radars: PointRadar[] = [];
      for (const row of r.rows) {
        if (row.targetId !== req.classId) continue;
        const placed = site.radars.find((p) => p.id === row.radarId) as PlacedRadar;
        const geo = azimuthAndDistanceXY(placed.x, placed.y, x, y);
        const budget = linkBudget(row.params, row.geometry.slantRangeM);
        radars.push({
          postId: row.radarId,
          postName: row.radarName,
          rangeM: row.geometry.slantRangeM,
          azimuthDeg: row.geometry.azimuthDeg ?? geo.azDeg,
          visible: row.visible,
          lowestVisibleAglM: row.lowestVisibleHeightAglM,
          diffractionLossDb: row.diffractionLossTwoWayDb,
          snrDb: row.snrDb,
          pd: row.pdTable,
          reason: row.reasonText,
          budget: budget.rows.map((b) => ({
            label: b.label,
            valueDb: b.valueDb,
            unit: b.unit,
            contributionDb: b.contributionDb,
            kind: b.kind,
          })),
          profile: terrainProfile(site, placed, { x, y }, req.heightM),
        });
      }
      return {
        generation: req.generation,
        lonDeg: req.lonDeg,
        latDeg: req.latDeg,
        heightM: req.heightM,
        classId: req.classId,
        combinedPd: r.combinedPd[req.classId] ?? Number.NaN,
        requiredPd: site.requirement.requiredPd,
        radars,
      };
    },
    async crashForTest() {
      setTimeout(() => {
        throw new Error("deliberate crash for a test");
      }, 0);
    },
  };
}
