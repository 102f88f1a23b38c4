/**
 * Terrain and building masking: the public interface of the per-radar horizon sweep and the
 * quantities that follow from it for any target height at once (visibility, lowest visible height,
 * clearance of the dominant obstruction). Rules TM1–TM9 in docs/model-spec.md.
 *
 * Geometry (effective-Earth model, ITU-R P.452-17 §4.3 / common practice): an object at horizontal
 * distance d appears lowered by d²/(2·k·a), a = EARTH_RADIUS_M, k the effective-Earth factor.
 * Relative to the antenna at height H (m ASL) an obstruction of height z (m ASL) at distance s has the
 * slope σ = (z − H)/s − s/(2·k·a). The horizon slope of a cell is the largest σ over the obstructions
 * strictly between the observer and the cell.
 */

import { EARTH_RADIUS_M, VISIBILITY_TOLERANCE_M } from "./constants.ts";
import type { Grid } from "./grid.ts";
import { computeHorizonAccurate } from "./maskAccurate.ts";
import { computeHorizonFast } from "./maskFast.ts";

/** Accurate: rays to every perimeter cell, all advanced together (R2 class). Fast: one raster sweep (XDraw/Wang family). */
export type MaskMode = "accurate" | "fast";

/** One observer's masking problem. */
export interface MaskInput {
  /** Obstruction surface (ground + buildings + trees), m above sea level, NaN = nodata. */
  surface: Grid;
  /** Observer x, m, in the grid's projected frame. */
  observerX: number;
  /** Observer y, m, in the grid's projected frame. */
  observerY: number;
  /** Antenna height above sea level, m. */
  antennaHeightAslM: number;
  /** Effective-Earth-radius factor k (> 0); Infinity = flat earth. */
  effectiveEarthFactor: number;
  /** Cells farther than this from the observer are left NaN, m. Default: no limit. */
  maxRangeM?: number;
  /** Sweep algorithm. */
  mode: MaskMode;
  /**
   * Radius around the observer inside which the surface never obstructs, m (the radar's own roof or
   * mast platform). Default 0: only the observer's own cell is excluded (rule TM2).
   */
  ownFootprintRadiusM?: number;
}

/** Per-cell horizon of one observer, row-major like the surface grid. */
export interface HorizonResult {
  /**
   * Tangent-like slope (m per m, curvature-corrected) of the steepest obstruction strictly between the
   * observer and the cell. -Infinity where nothing obstructs; NaN = nodata cell or out of range.
   */
  horizonSlope: Float32Array;
  /** Horizontal distance from the observer to that steepest obstruction, m (NaN if none). */
  obstacleDistanceM: Float32Array;
  /**
   * Horizontal distance from the observer (the centre of its cell) to the cell centre, m. A pure function
   * of the cell: computeHorizon fills it on first read, so callers that compute it themselves pay nothing.
   */
  distanceM: Float32Array;
  /** Columns (copy of the grid's). */
  width: number;
  /** Rows (copy of the grid's). */
  height: number;
  /** Column of the observer's cell (the observer is placed at its centre, rule TM1). */
  observerCol: number;
  /** Row of the observer's cell. */
  observerRow: number;
}

/** The observer lies outside the surface grid: masking is refused rather than guessed (rule TM8). */
export class ObserverOutsideGridError extends Error {
  override readonly name = "ObserverOutsideGridError";
  constructor(
    readonly observerX: number,
    readonly observerY: number,
  ) {
    super(
      `observer (${observerX}, ${observerY}) lies outside the surface grid; extend the terrain to cover every radar post`,
    );
  }
}

/**
 * Curvature factor 1/(2·k·a), m⁻¹: an object at distance d appears lowered by d²·factor
 * (effective-Earth model, ITU-R P.452-17 eq. 6a for a_e = k·a; common practice).
 * k = Infinity → 0 (flat earth). k ≤ 0 or NaN → NaN.
 */
export function curvatureFactorPerM(effectiveEarthFactor: number): number {
  if (!(effectiveEarthFactor > 0)) return Number.NaN;
  if (effectiveEarthFactor === Number.POSITIVE_INFINITY) return 0;
  return 1 / (2 * effectiveEarthFactor * EARTH_RADIUS_M);
}

/** Column and row of the cell containing the observer, or null when outside the grid or not finite. */
export function observerCell(input: MaskInput): { col: number; row: number } | null {
  const g = input.surface;
  const col = Math.floor((input.observerX - g.originX) / g.cellSizeM);
  const row = Math.floor((g.originY - input.observerY) / g.cellSizeM);
  if (!(col >= 0 && col < g.width && row >= 0 && row < g.height)) return null;
  return { col, row };
}

/** Geometry shared by both sweeps, after the observer has been placed. */
export interface SweepSetup {
  z: Float32Array;
  width: number;
  height: number;
  cellSizeM: number;
  observerCol: number;
  observerRow: number;
  antennaHeightAslM: number;
  curvaturePerM: number;
  maxRangeM: number;
  ownFootprintRadiusM: number;
}

/** Builds the sweep geometry; null when the numbers are outside the domain (the result is then all NaN). */
export function sweepSetup(input: MaskInput, col: number, row: number): SweepSetup | null {
  const curvaturePerM = curvatureFactorPerM(input.effectiveEarthFactor);
  const maxRangeM = input.maxRangeM ?? Number.POSITIVE_INFINITY;
  const ownFootprintRadiusM = input.ownFootprintRadiusM ?? 0;
  const g = input.surface;
  if (
    !Number.isFinite(input.antennaHeightAslM) ||
    Number.isNaN(curvaturePerM) ||
    !(maxRangeM > 0) ||
    !(ownFootprintRadiusM >= 0) ||
    !(g.cellSizeM > 0) ||
    g.data.length !== g.width * g.height
  )
    return null;
  return {
    z: g.data,
    width: g.width,
    height: g.height,
    cellSizeM: g.cellSizeM,
    observerCol: col,
    observerRow: row,
    antennaHeightAslM: input.antennaHeightAslM,
    curvaturePerM,
    maxRangeM,
    ownFootprintRadiusM,
  };
}

/** Fills `out` with the horizontal distance from the observer cell's centre to every cell centre, m. */
export function fillDistanceM(
  out: Float32Array,
  s: { width: number; height: number; cellSizeM: number },
  col: number,
  row: number,
): void {
  const w = s.width;
  const c = s.cellSizeM;
  for (let r = 0; r < s.height; r++) {
    const dy2 = (r - row) * (r - row);
    const base = r * w;
    for (let q = 0; q < w; q++) {
      const dx = q - col;
      out[base + q] = Math.sqrt(dx * dx + dy2) * c;
    }
  }
}

/** Where a result's distance array stands: filled lazily, on first read, for the observer it belongs to. */
interface DistanceState {
  buffer: Float32Array | null;
  filled: boolean;
  width: number;
  height: number;
  cellSizeM: number;
  col: number;
  row: number;
}

/** Distance state of every result computeHorizon returned (a reused result hands its state on). */
const distanceStates = new WeakMap<HorizonResult, DistanceState>();

function distanceOf(st: DistanceState): Float32Array {
  if (!st.filled) {
    st.buffer ??= new Float32Array(st.width * st.height);
    fillDistanceM(st.buffer, st, st.col, st.row);
    st.filled = true;
  }
  return st.buffer as Float32Array;
}

/**
 * Horizon sweep for one observer: per cell the curvature-corrected slope of the steepest obstruction
 * between the antenna and the cell, and its distance (docs/model-spec.md TM1–TM9).
 * Inputs: surface m ASL (NaN nodata), observer in the grid frame (m), antenna m ASL (finite),
 * k > 0 or Infinity, maxRangeM > 0 (optional), ownFootprintRadiusM ≥ 0 (optional).
 * Outputs in m per m and m. Out-of-domain numbers give an all-NaN result (the kernel stays total);
 * an observer outside the grid throws ObserverOutsideGridError.
 * Method: accurate = R2-class rays (Franklin & Ray 1994); fast = reference-plane sweep (Wang et al. 2000).
 * `distanceM` depends on the cell alone, not on the terrain: it is filled on first read (the derived
 * functions below never read it), so a caller that computes the distance itself pays nothing for it.
 * `reuse`: a previous result of the same grid size whose arrays are overwritten (no allocation while a
 * radar is dragged; the previous result then reads as the new one); otherwise new arrays are allocated.
 */
export function computeHorizon(input: MaskInput, reuse?: HorizonResult): HorizonResult {
  const cell = observerCell(input);
  if (cell === null) throw new ObserverOutsideGridError(input.observerX, input.observerY);
  const g = input.surface;
  const n = g.width * g.height;
  const setup = sweepSetup(input, cell.col, cell.row);
  // Without a range limit the sweeps write every cell; otherwise start from NaN.
  const writeAll = setup !== null && setup.maxRangeM === Number.POSITIVE_INFINITY;
  const same = reuse !== undefined && reuse.width === g.width && reuse.height === g.height;
  const horizonSlope = same ? reuse.horizonSlope : new Float32Array(n);
  const obstacleDistanceM = same ? reuse.obstacleDistanceM : new Float32Array(n);
  let st = same ? distanceStates.get(reuse) : undefined;
  if (st === undefined) {
    st = {
      buffer: same ? reuse.distanceM : null,
      filled: false,
      width: g.width,
      height: g.height,
      cellSizeM: g.cellSizeM,
      col: cell.col,
      row: cell.row,
    };
  } else if (st.col !== cell.col || st.row !== cell.row || st.cellSizeM !== g.cellSizeM) {
    st.filled = false;
    st.col = cell.col;
    st.row = cell.row;
    st.cellSizeM = g.cellSizeM;
  }
  const state = st;
  const result: HorizonResult = {
    horizonSlope,
    obstacleDistanceM,
    get distanceM(): Float32Array {
      return distanceOf(state);
    },
    set distanceM(v: Float32Array) {
      state.buffer = v;
      state.filled = true;
    },
    width: g.width,
    height: g.height,
    observerCol: cell.col,
    observerRow: cell.row,
  };
  distanceStates.set(result, state);
  if (!writeAll) {
    horizonSlope.fill(Number.NaN);
    obstacleDistanceM.fill(Number.NaN);
  }
  if (setup === null) return result;
  if (input.mode === "fast") computeHorizonFast(setup, horizonSlope, obstacleDistanceM);
  else computeHorizonAccurate(setup, horizonSlope, obstacleDistanceM);
  return result;
}

/** Cell size of the frame a horizon was computed on (the ground grid's when the result is not ours). */
function cellSizeOf(h: HorizonResult, ground: Grid): number {
  return distanceStates.get(h)?.cellSizeM ?? ground.cellSizeM;
}

/**
 * Per-row tables of the derived functions, indexed by |dx|: the distance as distanceM holds it (Float32
 * rounding, m) and H + d²/(2ka) (m ASL). One square root per |dx| serves both sides of the row.
 */
interface RowGeometry {
  distM: Float64Array;
  levelM: Float64Array;
}

function rowGeometry(h: HorizonResult): RowGeometry {
  const reach = Math.max(h.observerCol, h.width - 1 - h.observerCol) + 1;
  return { distM: new Float64Array(reach), levelM: new Float64Array(reach) };
}

function fillRowGeometry(g: RowGeometry, dy2: number, cell: number, antennaM: number, curv: number): void {
  const distM = g.distM;
  const levelM = g.levelM;
  for (let adx = 0; adx < distM.length; adx++) {
    const d = Math.fround(Math.sqrt(adx * adx + dy2) * cell);
    distM[adx] = d;
    levelM[adx] = antennaM + d * d * curv;
  }
}

function checkSizes(h: HorizonResult, ground: Grid): void {
  if (ground.width !== h.width || ground.height !== h.height)
    throw new RangeError(
      `ground grid ${ground.width}×${ground.height} does not match the horizon ${h.width}×${h.height}`,
    );
}

/**
 * Lowest target height above ground that the antenna sees at each cell, m AGL (rule TM5):
 * max(0, H + d²/(2ka) + σ·d − ground), values within VISIBILITY_TOLERANCE_M (1 mm) of 0 given as 0.
 * 0 where nothing obstructs; NaN where the horizon or the ground is
 * nodata / out of range. Same quantity as gdal_viewshed -om GROUND (GDAL 3.6 docs).
 * `ground` is m ASL on the same grid as the horizon. `out` may be `h.horizonSlope` itself: each cell's
 * slope is read before its height is written there.
 */
export function lowestVisibleHeightAglM(
  h: HorizonResult,
  ground: Grid,
  input: MaskInput,
  out?: Float32Array,
): Float32Array {
  checkSizes(h, ground);
  const n = h.width * h.height;
  const res = out ?? new Float32Array(n);
  const antenna = input.antennaHeightAslM;
  const curv = curvatureFactorPerM(input.effectiveEarthFactor);
  const hs = h.horizonSlope;
  const gz = ground.data;
  const w = h.width;
  const cell = cellSizeOf(h, ground);
  const geo = rowGeometry(h);
  const distM = geo.distM;
  const levelM = geo.levelM;
  // Floats made here: an imported constant or a Number.* property would be unboxed on every iteration.
  const tol = VISIBILITY_TOLERANCE_M * 1;
  const NEG = -Infinity;
  // Same row walk as visibleMask and obstructionClearanceM; change all three.
  for (let r = 0; r < h.height; r++) {
    const dy = r - h.observerRow;
    fillRowGeometry(geo, dy * dy, cell, antenna, curv);
    for (let q = 0, i = r * w, dx = -h.observerCol; q < w; q++, i++, dx++) {
      const s = hs[i];
      const adx = dx < 0 ? -dx : dx;
      const d = distM[adx];
      const g = gz[i];
      const v = levelM[adx] + s * d - g;
      if (v > tol) res[i] = v;
      // Visible from the ground up; a -Infinity slope (nothing obstructs) lands here too.
      else if (v <= tol) res[i] = 0;
      // NaN: nodata slope or ground, or the observer's own cell (-Infinity · 0).
      else res[i] = s === NEG && !Number.isNaN(g) ? 0 : Number.NaN;
    }
  }
  return res;
}

/**
 * Visibility of a target `targetHeightAglM` (m above ground, finite) at cell `index` (rule TM4):
 * the target is seen when its curvature-corrected slope from the antenna is not below the horizon slope
 * (within VISIBILITY_TOLERANCE_M of height, 1 mm).
 * Nodata, out of range or NaN height → false.
 */
export function isVisible(
  h: HorizonResult,
  ground: Grid,
  input: MaskInput,
  index: number,
  targetHeightAglM: number,
): boolean {
  const s = h.horizonSlope[index];
  const g = ground.data[index];
  if (!(!Number.isNaN(s) && !Number.isNaN(g) && Number.isFinite(targetHeightAglM))) return false;
  if (s === Number.NEGATIVE_INFINITY) return true;
  const dx = (index % h.width) - h.observerCol;
  const dy = Math.floor(index / h.width) - h.observerRow;
  const d = Math.fround(Math.sqrt(dx * dx + dy * dy) * cellSizeOf(h, ground));
  const curv = curvatureFactorPerM(input.effectiveEarthFactor);
  return input.antennaHeightAslM + d * d * curv + s * d - g <= targetHeightAglM + VISIBILITY_TOLERANCE_M;
}

/**
 * Visible (1) or hidden (0) per cell for one target height above ground, m (rule TM4); nodata and out of
 * range are 0. A NaN or infinite height gives all 0.
 */
export function visibleMask(
  h: HorizonResult,
  ground: Grid,
  input: MaskInput,
  targetHeightAglM: number,
  out?: Uint8Array,
): Uint8Array {
  checkSizes(h, ground);
  const n = h.width * h.height;
  const res = out ?? new Uint8Array(n);
  if (!Number.isFinite(targetHeightAglM)) {
    res.fill(0);
    return res;
  }
  const antenna = input.antennaHeightAslM;
  const curv = curvatureFactorPerM(input.effectiveEarthFactor);
  const hs = h.horizonSlope;
  const gz = ground.data;
  const limit = targetHeightAglM + VISIBILITY_TOLERANCE_M;
  const NEG = -Infinity;
  const w = h.width;
  const cell = cellSizeOf(h, ground);
  const geo = rowGeometry(h);
  const distM = geo.distM;
  const levelM = geo.levelM;
  // Same row walk as lowestVisibleHeightAglM and obstructionClearanceM; change all three.
  for (let r = 0; r < h.height; r++) {
    const dy = r - h.observerRow;
    fillRowGeometry(geo, dy * dy, cell, antenna, curv);
    for (let q = 0, i = r * w, dx = -h.observerCol; q < w; q++, i++, dx++) {
      const s = hs[i];
      const adx = dx < 0 ? -dx : dx;
      const d = distM[adx];
      const g = gz[i];
      const need = levelM[adx] + s * d - g;
      // NaN compares false → hidden; -Infinity slope gives -Infinity need → visible (when ground exists).
      res[i] = need <= limit || (s === NEG && !Number.isNaN(g)) ? 1 : 0;
    }
  }
  return res;
}

/**
 * Height of the dominant (steepest) obstruction above the straight sight line from the antenna to a
 * target at `targetHeightAglM` above ground, m, in the effective-Earth frame (rule TM6):
 * c = s·(σ − σ_t), s the obstruction distance, σ_t = (ground + h − H − d²/(2ka))/d the target's slope.
 * Positive = the line is obstructed, negative = it clears by that much. Pair with obstacleDistanceM and
 * distanceM (d1 = s, d2 = d − s) for a single knife-edge loss (ITU-R P.526-15 §4.1, eqs. 26–27).
 * -Infinity where nothing obstructs (and at the observer's cell); NaN for nodata / out of range.
 */
export function obstructionClearanceM(
  h: HorizonResult,
  ground: Grid,
  input: MaskInput,
  targetHeightAglM: number,
  out?: Float32Array,
): Float32Array {
  checkSizes(h, ground);
  const n = h.width * h.height;
  const res = out ?? new Float32Array(n);
  const antenna = input.antennaHeightAslM;
  const curv = curvatureFactorPerM(input.effectiveEarthFactor);
  const hs = h.horizonSlope;
  const od = h.obstacleDistanceM;
  const gz = ground.data;
  const w = h.width;
  const cell = cellSizeOf(h, ground);
  const geo = rowGeometry(h);
  const distM = geo.distM;
  const NEG = -Infinity;
  // Same row walk as lowestVisibleHeightAglM and visibleMask; change all three.
  for (let r = 0; r < h.height; r++) {
    const dy = r - h.observerRow;
    fillRowGeometry(geo, dy * dy, cell, antenna, curv);
    for (let q = 0, i = r * w, dx = -h.observerCol; q < w; q++, i++, dx++) {
      const s = hs[i];
      const g = gz[i];
      if (s === NEG && !Number.isNaN(g)) {
        res[i] = NEG;
        continue;
      }
      const d = distM[dx < 0 ? -dx : dx];
      const targetSlope = (g + targetHeightAglM - antenna - d * d * curv) / d;
      res[i] = od[i] * (s - targetSlope);
    }
  }
  return res;
}
