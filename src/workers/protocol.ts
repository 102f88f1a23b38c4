/**
 * The typed API between the planner and its coverage workers. Every request carries a generation
 * number; the pool drops replies older than the newest generation of their channel. Large arrays in
 * replies travel in comlink transfer lists (moved, never copied).
 */
import type { GridFrame } from "../coverage/grid";
import type { HeightMetrics } from "../coverage/metrics";
import type { Plan } from "../io/planSchema";
import type { GapShapesXY } from "./gapContours";

/** DEM bytes as the plan names them (terrain.ground.file). */
export interface DemPayload {
  fileName: string;
  /**
   * The file's bytes. Absent: the DEM of this `id` the worker last received with its bytes (the page
   * sends them once per worker, not with every request); a worker without it throws DemMissingError
   * and the page sends them again.
   */
  bytes?: ArrayBuffer;
  /**
   * The page's name for these bytes, new for every DEM it loads: a worker reuses the terrain it
   * prepared only for the same id. Without one (command line, tests), the file name and size decide,
   * which cannot tell a DEM edited in place from its earlier self.
   */
  id?: string;
}

export interface EvaluateRequest {
  generation: number;
  plan: Plan;
  /** The plan's footprints as JSON text, when `plan` carries none (planWire.ts; large imports). */
  buildingsJson?: string;
  /** The DEM the plan names (its bytes once per worker: DemPayload.bytes). */
  dem: DemPayload | null;
  /** "fast" for previews while dragging; "accurate" otherwise (the plan's own setting when absent). */
  maskMode?: "accurate" | "fast";
  /** The post whose single-radar Pd the map shows; only its per-radar arrays are sent (null: none). */
  perRadarPostId?: string | null;
  /** The terrainKey whose ground arrays the caller holds; they are not sent again. */
  haveTerrainKey?: string;
  /**
   * Compute and keep (per-radar cache, fusion memo) but reply with no arrays: a release computed
   * ahead while the dragged post rests (engine.ts), whose reply the page drops. Its step state (the
   * shown slice's gaps kept for a next step) is left as it was.
   */
  cacheOnly?: boolean;
  /**
   * Arrays of earlier previews the page no longer shows, moved back (their buffers in the transfer
   * list) for the worker to write the next previews into, so that a drag allocates no new arrays.
   */
  recycled?: (Float32Array | Uint8Array)[];
  /**
   * With a focus on an accurate run: compute every radar but fuse only the focused slice, and reply
   * with that one slice (`partial` in the view); a run of the same plan without it then takes every
   * radar from the cache and fuses the other slices.
   */
  sliceFirst?: boolean;
  /**
   * The caller holds the focused slice (from the sliceFirst step, which leaves out its gap outlines):
   * the reply fuses every other slice, leaves that one out, and brings its outlines (shownGapShapes).
   */
  shownSliceHeld?: boolean;
  /**
   * The map shows the lowest visible height. The lowest visible height over all radars is merged by
   * one step of a run only (siteSlices.mergesLowest): the sliceFirst step when it is shown; else, in a
   * run split into parts, a part without the shown slice, and in one part the step after sliceFirst.
   */
  lowestShown?: boolean;
  /**
   * The page does not show the lowest visible height: no step merges it (about 10 ms per 1 M cells and
   * 8 radars, on the critical path of a release); the reply's lowestVisibleAglM is empty. The page asks
   * again, without this, when the layer is shown (the radars come from the cache).
   */
  skipLowest?: boolean;
  /**
   * The class and height shown on the map. A preview (maskMode "fast") computes only this slice; a full
   * run computes every slice and outlines the gaps of this one.
   */
  focus?: { classId: string; heightM: number };
  /**
   * One part of an accurate run split over `count` workers: this reply holds only part `index` of the
   * slices (heights first, then classes, cut in equal runs), while `heightsM` and `classIds` list the
   * whole run's, so the caller can put the parts together (engine.ts mergePartViews).
   */
  part?: { index: number; count: number };
}

/** One target class at one height, fused over all enabled radars. */
export interface CoverageSlice {
  classId: string;
  heightM: number;
  /** Combined Pd per cell, 0…1 (0 where the cell is no valid target position). */
  combinedPd: Float32Array;
  /** Radars meeting the required Pd on their own, per cell. */
  overlap: Uint8Array;
  /** 1 where a cell of the protected area or approach ring is below the required Pd. */
  gap: Uint8Array;
  /**
   * Per radar (order of CoverageView.radarPostIds), Pd per cell; only the requested radar's array is
   * filled, the others are empty (length 0).
   */
  perRadarPd: Float32Array[];
  metrics: HeightMetrics;
  /** Gap outlines and labels in grid metres, for the focused slice of a full run only (see partial). */
  gapShapes?: GapShapesXY;
}

export interface CoverageView {
  generation: number;
  frame: GridFrame;
  /** Identity of the terrain rasters (ground, surface, obstruction tops) and frame. */
  terrainKey: string;
  /**
   * Ground elevation above sea level per cell, m (NaN nodata), for the hillshade. Empty (length 0)
   * when the terrain is the one sent before (same terrainKey): the receiver keeps the previous array.
   */
  groundAmslM: Float32Array;
  /** Obstruction (roof or canopy) top above ground per cell, m (0 where none); empty like groundAmslM. */
  obstructionTopAglM: Float32Array;
  /** Lowest visible height above ground per cell over all enabled radars, m (Infinity where none sees it). */
  lowestVisibleAglM: Float32Array;
  heightsM: number[];
  classIds: string[];
  /** Post ids of the radars that took part, in the order of perRadarPd. */
  radarPostIds: string[];
  slices: CoverageSlice[];
  maskMode: "accurate" | "fast";
  /** Plain statements about the run (flat ground, clipped DEM, …). */
  notes: string[];
  elapsedMs: number;
  /** Post ids of the radars this run computed (the others came from the worker's per-radar cache). */
  computedRadarIds?: string[];
  /** Only the focused slice of an accurate run (`sliceFirst`), without its gap outlines; the rest follows. */
  partial?: boolean;
  /** The gap outlines of the slice the caller holds (a reply to `shownSliceHeld`). */
  shownGapShapes?: GapShapesXY;
}

export interface PointRequest {
  generation: number;
  plan: Plan;
  dem: DemPayload | null;
  lonDeg: number;
  latDeg: number;
  heightM: number;
  classId: string;
}

/** One row of a link budget: a named term, its value in its dB unit and what it adds to the SNR. */
export interface BudgetRow {
  label: string;
  /** The term's own value in `unit`. */
  valueDb: number;
  /** "dBW", "dBi", "dB(m²)", "dBsm", "dB", "dB(m⁴)". */
  unit: string;
  /** What the row adds to the SNR, dB (the SNR itself for the result row). */
  contributionDb: number;
  kind: "term" | "result";
}

/** A terrain profile from a radar to the point, distances along the path. */
export interface ProfileData {
  distanceM: number[];
  /** Ground above sea level, m. */
  groundAmslM: number[];
  /** Ground plus obstructions (roofs, canopy) above sea level, m. */
  surfaceAmslM: number[];
  /** Antenna height above sea level, m. */
  antennaAmslM: number;
  /** Target height above sea level, m. */
  targetAmslM: number;
  /** Earth-curvature drop along the path for the effective Earth factor, m (subtracted from surfaces). */
  curvatureDropM: number[];
  /** First Fresnel zone radius along the path, m. */
  fresnelRadiusM: number[];
  frequencyHz: number;
}

export interface PointRadar {
  postId: string;
  postName: string;
  rangeM: number;
  azimuthDeg: number;
  visible: boolean;
  lowestVisibleAglM: number;
  diffractionLossDb: number;
  snrDb: number;
  pd: number;
  /** Why the point is not covered by this radar ("covered" when it is). */
  reason: string;
  budget: BudgetRow[];
  profile: ProfileData | null;
}

export interface PointReply {
  generation: number;
  lonDeg: number;
  latDeg: number;
  heightM: number;
  classId: string;
  combinedPd: number;
  requiredPd: number;
  radars: PointRadar[];
}

/** How far a run is: radars computed (or taken from the cache), then fusion steps done. */
export interface RunProgress {
  stage: "radars" | "fusion";
  done: number;
  total: number;
}

/** Told of a run's progress (across a worker boundary through a comlink proxy). */
export type ProgressListener = (p: RunProgress) => void;

/** Methods a coverage worker exposes (and the inline implementation provides). */
export interface CoverageApi {
  evaluate(req: EvaluateRequest, onProgress?: ProgressListener): Promise<CoverageView>;
  point(req: PointRequest): Promise<PointReply>;
  /** Crashes the worker on purpose (tests of the crash recovery). */
  crashForTest(): Promise<void>;
  /**
   * A newer generation was submitted: a run of an older one stops at its next check (between radars)
   * with a CancelledError instead of finishing work nobody will see.
   */
  supersede(generation: number): Promise<void>;
  /**
   * The page's run is complete (every part and step landed): the worker may now use its idle time to
   * prepare memory for the next release (CoverageApiOptions.warmWhenIdle). Started any earlier, between
   * the steps of a release, that work would take a core from the other worker's part of it.
   */
  settled(): Promise<void>;
}

/** The arrays of a view, for a transfer list. */
export function viewTransferables(v: CoverageView): Transferable[] {
  const list: ArrayBufferLike[] = [
    v.groundAmslM.buffer,
    v.obstructionTopAglM.buffer,
    v.lowestVisibleAglM.buffer,
  ];
  for (const s of v.slices) {
    list.push(s.combinedPd.buffer, s.overlap.buffer, s.gap.buffer);
    for (const g of s.gapShapes?.outlines ?? []) for (const r of g.rings) list.push(r.buffer);
    for (const p of s.perRadarPd) list.push(p.buffer);
  }
  for (const g of v.shownGapShapes?.outlines ?? []) for (const r of g.rings) list.push(r.buffer);
  return [...new Set(list)].filter((b) => b.byteLength > 0) as Transferable[];
}
