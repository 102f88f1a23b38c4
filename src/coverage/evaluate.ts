/**
 * The coverage engine's entry points, used alike by the CLI, the workers and the app:
 * evaluateSite (every radar, every height and class, fused, with metrics) and evaluatePoint (one
 * position: per radar the link budget, visibility, lowest visible height, diffraction loss, Pd, reason).
 *
 * A PreparedSite holds only plain data and typed arrays (no functions, no class instances), so it
 * can be posted or transferred to a worker. The flow inside: per radar (cached by radarCache.ts):
 * horizon sweep → radar stage (coverage.ts); then per class and height: fusion → metrics.
 */
import {
  type DetectionRequirement,
  kernelFor,
  type PlacedRadar,
  type RadarCoverage,
  type RadarExtent,
  REASON_TEXT,
  type Reason,
  radarCoverageFromHorizon,
  type TargetSpec,
} from "./coverage.ts";
import { coveragePoint, type PointCoverage } from "./coveragePoint.ts";
import {
  CellState,
  cellStatesAtHeight,
  type FusedHeight,
  fuseHeight,
  mergeLowestVisibleInto,
} from "./fusion.ts";
import type { FusionMemo } from "./fusionMemo.ts";
import type { GridFrame } from "./grid.ts";
import { type LinkBudget, linkBudget } from "./linkBudget.ts";
import { type HeightMetrics, heightMetrics } from "./metrics.ts";
import { hashRaster, type RadarResultCache, radarResultKey } from "./radarCache.ts";
import { rayMarchCell } from "./rayMarch.ts";
import type { RegionMasks } from "./regionMask.ts";
import {
  computeHorizon,
  curvatureFactorPerM,
  type HorizonResult,
  type MaskInput,
  type MaskMode,
} from "./terrainMask.ts";

/** A target class with its display name. */
export interface SiteTarget extends TargetSpec {
  name: string;
}

/** Everything a coverage run needs, on the site grid. Plain data, transferable to workers. */
export interface PreparedSite {
  /** Site name for reports. */
  name: string;
  frame: GridFrame;
  /** Ground elevation, m ASL (NaN nodata), row-major on the frame. */
  ground: Float32Array;
  /** Obstruction surface (ground + buildings + trees), m ASL. */
  surface: Float32Array;
  /** Building or canopy top above ground per cell, m (0 on open ground). */
  obstructionTopAglM: Float32Array;
  regions: RegionMasks;
  /** Enabled radars, placed on the grid. */
  radars: PlacedRadar[];
  targets: SiteTarget[];
  requirement: DetectionRequirement & {
    /** Classes the requirement applies to (all when the plan names none). */
    targetIds: string[];
  };
  /** Target heights above ground, m, ascending. */
  heightsAglM: number[];
  effectiveEarthFactor: number;
  maskMode: MaskMode;
  /** "dem" when the ground came from a DEM, "flat" when none was given (say so in results). */
  groundSource: "dem" | "flat";
  /**
   * Identity of ground, surface and obstruction tops (set by preparePlan, computed when absent). A caller
   * that changes those arrays in place must clear it, or cached radars would be taken as still valid.
   */
  terrainId?: string;
  /** Warnings gathered while preparing (import, placement), shown with the results. */
  warnings: string[];
}

/** One class at one height, fused over the radars. */
export interface SiteHeightResult extends FusedHeight {
  heightAglM: number;
  /** CellState per cell at this height. */
  cellState: Uint8Array;
  metrics: HeightMetrics;
  /** With a FusionMemo: the identity of the gap raster (equal numbers, equal gap cells). */
  gapVersion?: number;
}

export interface SiteTargetResult {
  targetId: string;
  name: string;
  /** Whether the requirement applies to this class. */
  requirementApplies: boolean;
  /** Only the heights this class is judged at. */
  heights: SiteHeightResult[];
}

export interface SiteResult {
  frame: GridFrame;
  heightsAglM: number[];
  radarIds: string[];
  requiredPd: number;
  /** Per radar, in the order of site.radars. */
  radars: RadarCoverage[];
  /**
   * Lowest height above ground that at least one radar sees, m (NaN where none computed); empty when
   * the run was asked not to merge it (EvaluateOptions.lowestVisible false).
   */
  lowestVisibleHeightAglM: Float32Array;
  targets: SiteTargetResult[];
  /** Radars computed in this run, and those taken from the cache. */
  computedRadarIds: string[];
  cachedRadarIds: string[];
  timingsMs: { radars: number; fusion: number; total: number };
}

/** Progress of a run: a stage, and how many of its steps are done. */
export interface EvaluateProgress {
  stage: "radars" | "fusion";
  done: number;
  total: number;
  radarId?: string;
}

/**
 * Computes one radar's coverage: inline by default, or on a worker. `reuse`, when given, is a result
 * of the same shape whose arrays may be overwritten (and, for a worker, transferred).
 */
export type RadarRunner = (
  site: PreparedSite,
  radarIndex: number,
  mode: MaskMode,
  reuse?: RadarCoverage,
) => Promise<RadarCoverage>;

export interface EvaluateOptions {
  /** Masking mode; default the site's. */
  mode?: MaskMode;
  onProgress?: (p: EvaluateProgress) => void;
  /** Checked between radars and between fusion steps; true stops the run with a CancelledError. */
  shouldCancel?: () => boolean;
  /** An abort signal (anything with a boolean `aborted`), checked like shouldCancel. */
  signal?: { readonly aborted: boolean };
  /** Per-radar cache; results are looked up and stored by radarKey. */
  cache?: RadarResultCache<RadarCoverage>;
  /** Radars computed are kept as computed ahead of need (RadarResultCache.setAhead), not as entries. */
  cacheAhead?: boolean;
  /** How a radar is computed (default computeRadarCoverage in this thread). Runs are started together. */
  runRadar?: RadarRunner;
  /** How a fusion step is run (default fuseSiteHeight in this thread). Steps are started together. */
  runFusion?: FusionRunner;
  /**
   * A previous result of this site that the caller no longer needs: each recomputed radar writes into
   * that radar's old arrays (same id, same shape) instead of allocating new ones, and the fused rasters,
   * cell states and lowest visible height are written into its arrays of the same class and height.
   * Never pass a result whose radars or rasters are still held by a cache or shown elsewhere: their
   * arrays are overwritten.
   */
  previous?: SiteResult;
  /**
   * Fused heights kept from the caller's previous runs of this site (fusionMemo.ts): a slice whose
   * radars changed only in part is fused again only where they changed. The result's fused rasters
   * then belong to the memo (copy them to keep or send them). Needs the radars' keys: from `cache`,
   * else from `radarKeys`; without either the memo is not used.
   */
  fusionMemo?: FusionMemo;
  /** Per radar in site order, the identity of its result (radarKey), for `fusionMemo` without `cache`. */
  radarKeys?: readonly string[];
  /**
   * false: skip merging the lowest visible height (the result's array is then empty); for a caller
   * that has it from another run of the same radars. Default true.
   */
  lowestVisible?: boolean;
}

/** A run stopped by its caller (recognise it by name across worker boundaries). */
export class CancelledError extends Error {
  override name = "CancelledError";
  constructor() {
    super("coverage run cancelled");
  }
}

/** Identity of the site's terrain rasters and grid frame. */
export function siteTerrainId(site: PreparedSite): string {
  if (site.terrainId !== undefined) return site.terrainId;
  const f = site.frame;
  return [
    hashRaster(site.ground),
    hashRaster(site.surface),
    hashRaster(site.obstructionTopAglM),
    f.width,
    f.height,
    f.originX,
    f.originY,
    f.cellSizeM,
    f.crs,
  ].join("|");
}

/** The cache key of one radar of a site (everything that radar's result depends on). */
export function radarKey(
  site: PreparedSite,
  radarIndex: number,
  mode: MaskMode,
  terrainId = siteTerrainId(site),
): string {
  const r = site.radars[radarIndex];
  return radarResultKey({
    model: r.model,
    placement: {
      x: r.x,
      y: r.y,
      antennaHeightAslM: r.antennaHeightAslM,
      boresightAzDeg: r.boresightAzDeg,
      tiltDeg: r.tiltDeg,
      scan: r.scan,
      ownFootprintRadiusM: r.ownFootprintRadiusM,
      id: r.id,
    },
    terrainId,
    heightsAglM: site.heightsAglM,
    targets: site.targets.map((t) => ({
      id: t.id,
      rcsDbsm: t.rcsDbsm,
      swerling: t.swerling,
      h: t.heightsAglM,
    })),
    settings: {
      requiredPd: site.requirement.requiredPd,
      pfa: site.requirement.pfa,
      looks: site.requirement.looks,
      k: site.effectiveEarthFactor,
      mode,
    },
  });
}

function maskInputFor(site: PreparedSite, radar: PlacedRadar, mode: MaskMode, maxRangeM: number): MaskInput {
  return {
    surface: { ...site.frame, data: site.surface },
    observerX: radar.x,
    observerY: radar.y,
    antennaHeightAslM: radar.antennaHeightAslM,
    effectiveEarthFactor: site.effectiveEarthFactor,
    maxRangeM: Number.isFinite(maxRangeM) ? maxRangeM : undefined,
    mode,
    ownFootprintRadiusM: radar.ownFootprintRadiusM,
  };
}

/** The last horizon computed in this thread, whose arrays the next computeRadarCoverage overwrites. */
let horizonScratch: HorizonResult | undefined;

/**
 * One radar's coverage in this thread: horizon sweep (terrainMask.ts) limited to the maximum
 * instrumented range, then the radar stage (coverage.ts). `reuse`: a previous result of the same
 * shape to overwrite (see radarCoverageFromHorizon). Throws ObserverOutsideGridError when the radar
 * stands outside the grid.
 */
export function computeRadarCoverage(
  site: PreparedSite,
  radarIndex: number,
  mode: MaskMode = site.maskMode,
  reuse?: RadarCoverage,
): RadarCoverage {
  const radar = site.radars[radarIndex];
  const kernel = kernelFor({
    radar,
    targets: site.targets,
    requirement: site.requirement,
    effectiveEarthFactor: site.effectiveEarthFactor,
  });
  // The horizon is used only inside this call, so its arrays are kept for the next radar of this
  // thread (no new memory to fault in per radar).
  const horizon = computeHorizon(maskInputFor(site, radar, mode, kernel.maxRangeM), horizonScratch);
  horizonScratch = horizon;
  return radarCoverageFromHorizon(
    {
      frame: site.frame,
      ground: site.ground,
      obstructionTopAglM: site.obstructionTopAglM,
      radar,
      targets: site.targets,
      heightsAglM: site.heightsAglM,
      requirement: site.requirement,
      effectiveEarthFactor: site.effectiveEarthFactor,
    },
    kernel,
    horizon,
    reuse,
  );
}

function checkCancel(opts: EvaluateOptions): void {
  if (opts.signal?.aborted || opts.shouldCancel?.()) throw new CancelledError();
}

/** One fusion step of a run: one target class at one height. */
export interface FusionJob {
  /** Index into site.targets. */
  targetIndex: number;
  /** Index into site.heightsAglM (and into each radar's heights). */
  heightIndex: number;
  /** Per radar, in site order, the square its stage visited (RadarCoverage.extent). */
  extents: (RadarExtent | undefined)[];
}

/**
 * Runs one fusion step elsewhere (e.g. a worker that holds every radar's result in shared memory);
 * must return what fuseSiteHeight returns for the same radars.
 */
export type FusionRunner = (site: PreparedSite, job: FusionJob) => Promise<SiteHeightResult>;

/**
 * Per radar, the rectangle outside which its Pd of the job's class and height is 0: the stage's
 * bounds of its Pd > 0 cells where known, else the job's (the radar's square).
 */
function sliceExtents(radars: readonly RadarCoverage[], job: FusionJob): (RadarExtent | undefined)[] {
  return radars.map((r, i) => r.heights[job.heightIndex].targets[job.targetIndex].pdExtent ?? job.extents[i]);
}

/**
 * One fusion step: the fused rasters (fusion.ts) and the metrics (metrics.ts) of one class at one
 * height over the radars' results (in site order). `reuse`: the cell states of this height when
 * already computed, and a previous fused height whose arrays may be overwritten.
 */
export function fuseSiteHeight(
  site: PreparedSite,
  radars: readonly RadarCoverage[],
  job: FusionJob,
  reuse: { cellState?: Uint8Array; fused?: FusedHeight } = {},
): SiteHeightResult {
  const { targetIndex: t, heightIndex: k } = job;
  const h = site.heightsAglM[k];
  const pdPerRadar = radars.map((r) => r.heights[k].targets[t].pd!);
  const extents = sliceExtents(radars, job);
  const cellState = reuse.cellState ?? cellStatesAtHeight(site.ground, site.obstructionTopAglM, h);
  const fused = fuseHeight({
    pdPerRadar,
    requiredPd: site.requirement.requiredPd,
    cellState,
    regions: site.regions,
    extents,
    width: site.frame.width,
    out: reuse.fused,
  });
  const metrics = heightMetrics({
    heightAglM: h,
    fused,
    pdPerRadar,
    radarIds: site.radars.map((r) => r.id),
    requiredPd: site.requirement.requiredPd,
    cellState,
    regions: site.regions,
    width: site.frame.width,
    height: site.frame.height,
    originX: site.frame.originX,
    originY: site.frame.originY,
    cellSizeM: site.frame.cellSizeM,
    extents,
  });
  return { ...fused, heightAglM: h, cellState, metrics };
}

/** Identity of a site's region masks, hashed once per masks object. */
const regionIds = new WeakMap<RegionMasks, string>();
function regionsId(regions: RegionMasks): string {
  let id = regionIds.get(regions);
  if (id === undefined) {
    id = `${hashRaster(regions.protectedArea)}/${hashRaster(regions.approachRing)}`;
    regionIds.set(regions, id);
  }
  return id;
}

/** fuseSiteHeight through a FusionMemo: the same figures, fused again only where radars changed. */
export function fuseSiteHeightMemo(
  site: PreparedSite,
  radars: readonly RadarCoverage[],
  job: FusionJob,
  memo: FusionMemo,
  radarKeys: readonly string[],
  cellState: Uint8Array,
): SiteHeightResult {
  const { targetIndex: t, heightIndex: k } = job;
  const h = site.heightsAglM[k];
  const requiredPd = site.requirement.requiredPd;
  const extents = sliceExtents(radars, job);
  const r = memo.fuse({
    sliceKey: `${site.targets[t].id}\u0000${h}`,
    context: [siteTerrainId(site), h, requiredPd, regionsId(site.regions)].join("|"),
    radarKeys,
    pdPerRadar: radars.map((x) => x.heights[k].targets[t].pd!),
    extents,
    radarIds: site.radars.map((x) => x.id),
    requiredPd,
    cellState,
    regions: site.regions,
    heightAglM: h,
    grid: site.frame,
  });
  return { ...r.fused, heightAglM: h, cellState, metrics: r.metrics, gapVersion: r.gapVersion };
}

interface Port {
  onmessage: (() => void) | null;
  postMessage(value: unknown): void;
  close(): void;
}

/**
 * Resolve on a later turn of the event loop: a message to itself where there is a MessageChannel
 * (browsers, workers, Node), else a zero-delay timer. Unlike a timer, a message is not held back to
 * 4 ms once timers nest (HTML timers: from the fifth nested call), which a run yielding between
 * radars would pay again and again.
 */
export function yieldToEventLoop(): Promise<void> {
  const g = globalThis as {
    MessageChannel?: new () => { port1: Port; port2: Port };
    setTimeout?: (fn: () => void, ms: number) => unknown;
  };
  const Channel = g.MessageChannel;
  if (Channel) {
    return new Promise((resolve) => {
      const { port1, port2 } = new Channel();
      port1.onmessage = () => {
        port1.close();
        port2.close();
        resolve();
      };
      port2.postMessage(null);
    });
  }
  const timer = g.setTimeout;
  return new Promise((resolve) => (timer ? timer(resolve, 0) : resolve()));
}

/** Milliseconds from a monotonic clock where there is one (browsers, workers, Node), else Date.now(). */
function now(): number {
  const perf = (globalThis as { performance?: { now(): number } }).performance;
  return perf ? perf.now() : Date.now();
}

/**
 * Lowest height above ground that at least one radar sees, per cell (NaN where none computed), into
 * the previous result's array when it can be overwritten.
 */
function mergeLowestVisible(
  site: PreparedSite,
  radars: readonly RadarCoverage[],
  prev: SiteResult | undefined,
): Float32Array {
  const n = site.frame.width * site.frame.height;
  const reusable =
    prev !== undefined && prev.frame.width === site.frame.width && prev.frame.height === site.frame.height;
  const lowest =
    reusable &&
    prev.lowestVisibleHeightAglM.length === n &&
    !radars.some((r) => r.lowestVisibleHeightAglM === prev.lowestVisibleHeightAglM)
      ? prev.lowestVisibleHeightAglM
      : new Float32Array(n);
  mergeLowestVisibleInto(lowest, site.frame, radars);
  return lowest;
}

/** The cache group of a radar's results (RadarResultCacheOptions.perGroup): one post in one mask mode. */
export function radarGroup(radar: PlacedRadar, mode: MaskMode): string {
  return `${radar.id}\u0000${mode}`;
}

/**
 * Evaluate a prepared site: every enabled radar (from the cache when its key is unchanged), then per
 * target class and height the fused Pd, overlap, best radar, gaps and metrics.
 * @returns the SiteResult; throws CancelledError when cancelled, ObserverOutsideGridError for a radar
 *   off the grid.
 */
export async function evaluateSite(site: PreparedSite, opts: EvaluateOptions = {}): Promise<SiteResult> {
  const t0 = now();
  const mode = opts.mode ?? site.maskMode;
  const runRadar: RadarRunner =
    opts.runRadar ?? (async (s, i, m, reuse) => computeRadarCoverage(s, i, m, reuse));
  const previousById = new Map((opts.previous?.radars ?? []).map((r) => [r.radarId, r]));

  // Hashing the terrain costs tens of ms on a large grid; only the cache keys need it.
  const terrainId = opts.cache ? siteTerrainId(site) : "";
  const total = site.radars.length;
  const computedRadarIds: string[] = [];
  const cachedRadarIds: string[] = [];
  let done = 0;
  checkCancel(opts);
  opts.onProgress?.({ stage: "radars", done: 0, total });
  const keys: string[] = [];
  const one = async (radar: PlacedRadar, i: number): Promise<RadarCoverage> => {
    const key = opts.cache ? radarKey(site, i, mode, terrainId) : "";
    keys[i] = key;
    const cached = opts.cache?.get(key);
    let result: RadarCoverage;
    if (cached !== undefined) {
      opts.cache!.hits++;
      cachedRadarIds.push(radar.id);
      result = cached;
    } else {
      checkCancel(opts);
      // Into the previous result's arrays of this radar, else into a result that left the cache.
      result = await runRadar(site, i, mode, previousById.get(radar.id) ?? opts.cache?.takeSpare());
      checkCancel(opts);
      computedRadarIds.push(radar.id);
      if (opts.cache) {
        opts.cache.computed++;
        if (opts.cacheAhead) opts.cache.setAhead(key, result, radarGroup(radar, mode));
        else opts.cache.set(key, result, radarGroup(radar, mode));
      }
    }
    done++;
    opts.onProgress?.({ stage: "radars", done, total, radarId: radar.id });
    return result;
  };
  let radars: RadarCoverage[];
  if (opts.runRadar) {
    // Workers: all radars in flight together.
    radars = await Promise.all(site.radars.map(one));
  } else {
    // In this thread: one radar at a time, yielding after each one computed so progress can be drawn
    // and a cancel request (a message, a timer) can arrive (a radar from the cache takes no time).
    radars = [];
    for (let i = 0; i < site.radars.length; i++) {
      const computedBefore = computedRadarIds.length;
      radars.push(await one(site.radars[i], i));
      if (i + 1 < site.radars.length && computedRadarIds.length > computedBefore) await yieldToEventLoop();
    }
  }
  const t1 = now();

  const n = site.frame.width * site.frame.height;
  // Arrays of the previous result (which the caller no longer needs) are overwritten, not allocated.
  const prev = opts.previous;
  const reusable =
    prev !== undefined && prev.frame.width === site.frame.width && prev.frame.height === site.frame.height;
  const extents = radars.map((r) => r.extent);
  /** A previous fused height of this class and height, when its arrays can be overwritten. */
  const previousHeight = (targetId: string, h: number): SiteHeightResult | undefined =>
    reusable
      ? prev.targets.find((t) => t.targetId === targetId)?.heights.find((x) => x.heightAglM === h)
      : undefined;

  const radarIds = site.radars.map((r) => r.id);
  const fusionSteps = site.targets.reduce(
    (acc, t) => acc + site.heightsAglM.filter((h) => t.heightsAglM.includes(h)).length,
    0,
  );
  let fusionDone = 0;
  const states = new Map<number, Uint8Array>();
  const previousStates = new Map<number, Uint8Array>();
  if (reusable)
    for (const t of prev.targets)
      for (const x of t.heights) if (x.cellState.length === n) previousStates.set(x.heightAglM, x.cellState);
  const stateAt = (h: number): Uint8Array => {
    let s = states.get(h);
    if (s === undefined) {
      const compute = () =>
        cellStatesAtHeight(site.ground, site.obstructionTopAglM, h, previousStates.get(h));
      s = opts.fusionMemo ? opts.fusionMemo.cellStates(siteTerrainId(site), h, compute) : compute();
      states.set(h, s);
    }
    return s;
  };
  const jobs: FusionJob[] = [];
  site.targets.forEach((target, t) => {
    site.heightsAglM.forEach((h, k) => {
      if (target.heightsAglM.includes(h)) jobs.push({ targetIndex: t, heightIndex: k, extents });
    });
  });
  let fused: SiteHeightResult[];
  let lowest: Float32Array;
  const memoKeys = opts.fusionMemo ? (opts.cache ? keys : opts.radarKeys) : undefined;
  if (memoKeys !== undefined && memoKeys.length !== site.radars.length)
    throw new RangeError(`radarKeys: ${memoKeys.length} keys for ${site.radars.length} radars`);
  if (opts.runFusion) {
    // Elsewhere (workers holding the radars' results): all steps in flight together, the lowest
    // visible height merged here meanwhile.
    const runFusion = opts.runFusion;
    checkCancel(opts);
    const steps = Promise.all(
      jobs.map(async (job) => {
        const r = await runFusion(site, job);
        fusionDone++;
        opts.onProgress?.({ stage: "fusion", done: fusionDone, total: fusionSteps });
        return r;
      }),
    );
    lowest = opts.lowestVisible === false ? new Float32Array(0) : mergeLowestVisible(site, radars, prev);
    fused = await steps;
    checkCancel(opts);
  } else {
    lowest =
      opts.lowestVisible === false
        ? new Float32Array(0)
        : memoKeys
          ? opts.fusionMemo!.lowest(siteTerrainId(site), site.frame, radars, memoKeys)
          : mergeLowestVisible(site, radars, prev);
    fused = jobs.map((job) => {
      checkCancel(opts);
      const h = site.heightsAglM[job.heightIndex];
      const r = memoKeys
        ? fuseSiteHeightMemo(site, radars, job, opts.fusionMemo!, memoKeys, stateAt(h))
        : fuseSiteHeight(site, radars, job, {
            cellState: stateAt(h),
            fused: previousHeight(site.targets[job.targetIndex].id, h),
          });
      fusionDone++;
      opts.onProgress?.({ stage: "fusion", done: fusionDone, total: fusionSteps });
      return r;
    });
  }
  const targets: SiteTargetResult[] = site.targets.map((target, t) => ({
    targetId: target.id,
    name: target.name,
    requirementApplies: site.requirement.targetIds.includes(target.id),
    heights: fused.filter((_, j) => jobs[j].targetIndex === t),
  }));
  const t2 = now();
  return {
    frame: site.frame,
    heightsAglM: [...site.heightsAglM],
    radarIds,
    requiredPd: site.requirement.requiredPd,
    radars,
    lowestVisibleHeightAglM: lowest,
    targets,
    computedRadarIds,
    cachedRadarIds,
    timingsMs: { radars: t1 - t0, fusion: t2 - t1, total: t2 - t0 },
  };
}

// ---------------------------------------------------------------------------------------------
// One point

/** One radar against one class at the inspected point. */
export interface PointRadarRow extends PointCoverage {
  radarId: string;
  radarName: string;
  targetId: string;
  /** Lowest visible target height above ground here, m (exact ray march). */
  lowestVisibleHeightAglM: number;
  /** Two-way diffraction loss, dB (2·J). */
  diffractionLossTwoWayDb: number;
  reasonText: string;
  /** Link budget rows at the slant range (gains towards the target, gas loss and F⁴ included). */
  linkBudget: LinkBudget;
}

export interface PointResult {
  /** The inspected position in the grid frame, m, and its cell. */
  x: number;
  y: number;
  col: number;
  row: number;
  heightAglM: number;
  groundM: number;
  obstructionTopAglM: number;
  /** Per radar and class. */
  rows: PointRadarRow[];
  /** Combined Pd per class id (1 − Π(1 − Pd_i) over the table Pds). */
  combinedPd: Record<string, number>;
  /** CellState at this height. */
  cellState: number;
}

/** Lowest visible height above ground at one cell, m (terrainMask.ts rule TM5); NaN for nodata. */
function lowestVisibleAt(
  slope: number,
  distanceM: number,
  antennaAslM: number,
  groundM: number,
  curv: number,
): number {
  if (Number.isNaN(slope) || Number.isNaN(groundM)) return Number.NaN;
  if (slope === Number.NEGATIVE_INFINITY) return 0;
  return Math.max(0, antennaAslM + distanceM * distanceM * curv + slope * distanceM - groundM);
}

/**
 * Inspect one position: per radar and class, the exact path (coveragePoint) with the horizon of this
 * cell from the exact ray march (rayMarch.ts), the link budget, the lowest visible height and the reason.
 * @param at position in the grid frame, m; heightAglM target height above ground, m (finite, ≥ 0).
 * @returns the rows; throws RangeError naming the field when the point is outside the grid.
 */
export function evaluatePoint(
  site: PreparedSite,
  at: { x: number; y: number },
  heightAglM: number,
): PointResult {
  const f = site.frame;
  const col = Math.floor((at.x - f.originX) / f.cellSizeM);
  const row = Math.floor((f.originY - at.y) / f.cellSizeM);
  if (!(col >= 0 && col < f.width && row >= 0 && row < f.height)) {
    throw new RangeError(`at: (${at.x.toFixed(1)}, ${at.y.toFixed(1)}) lies outside the site grid`);
  }
  if (!(Number.isFinite(heightAglM) && heightAglM >= 0)) {
    throw new RangeError(`heightAglM: ${heightAglM} must be a finite height ≥ 0 m`);
  }
  const i = row * f.width + col;
  const groundM = site.ground[i];
  const top = site.obstructionTopAglM[i];
  const rows: PointRadarRow[] = [];
  const miss: Record<string, number> = {};
  const curv = curvatureFactorPerM(site.effectiveEarthFactor);
  for (const radar of site.radars) {
    const input = maskInputFor(site, radar, "accurate", Number.POSITIVE_INFINITY);
    const ocol = Math.floor((radar.x - f.originX) / f.cellSizeM);
    const orow = Math.floor((f.originY - radar.y) / f.cellSizeM);
    const horizon = rayMarchCell(input, col, row);
    const eastM = (col - ocol) * f.cellSizeM;
    const northM = (orow - row) * f.cellSizeM;
    const distanceM = Math.hypot(eastM, northM);
    const lowest = lowestVisibleAt(horizon.slope, distanceM, radar.antennaHeightAslM, groundM, curv);
    for (const target of site.targets) {
      const pc = coveragePoint(
        {
          radar,
          target,
          requirement: site.requirement,
          effectiveEarthFactor: site.effectiveEarthFactor,
          heightAglM,
        },
        {
          horizonSlope: horizon.slope,
          obstacleDistanceM: horizon.obstacleDistanceM,
          distanceM,
          eastM,
          northM,
          groundM,
          obstructionTopAglM: top,
          cellSizeM: f.cellSizeM,
        },
      );
      miss[target.id] = (miss[target.id] ?? 1) * (1 - pc.pdTable);
      rows.push({
        ...pc,
        radarId: radar.id,
        radarName: radar.name,
        targetId: target.id,
        lowestVisibleHeightAglM: lowest,
        diffractionLossTwoWayDb: 2 * pc.diffractionLossOneWayDb,
        reasonText: REASON_TEXT[pc.reason as Reason],
        linkBudget: linkBudget(pc.params, pc.geometry.slantRangeM),
      });
    }
  }
  const combinedPd: Record<string, number> = {};
  for (const t of site.targets) combinedPd[t.id] = 1 - (miss[t.id] ?? 1);
  const cellState = cellStatesAtHeight(Float32Array.of(groundM), Float32Array.of(top), heightAglM)[0];
  if (cellState !== CellState.valid) for (const t of site.targets) combinedPd[t.id] = 0;
  return {
    x: at.x,
    y: at.y,
    col,
    row,
    heightAglM,
    groundM,
    obstructionTopAglM: top,
    rows,
    combinedPd,
    cellState,
  };
}
