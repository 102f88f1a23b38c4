/**
 * The per-radar coverage stage: from one radar's horizon (terrainMask.ts) to SNR, Pd and the reason a
 * cell is or is not covered, per target height and target class (DESIGN.md model steps 4–6).
 *
 * Per cell and height, with Δh the target's height above the antenna after Earth curvature
 * (Δh = ground + h − H − d²/(2ka)), R² = d² + Δh² the slant range and sin(el) = Δh/R:
 *
 *   SNR = C · g_t(az, el) · g_r(az, el) · F⁴(v) · A(R) / R⁴
 *
 * C the radar's constant for a 1 m² target with peak gains (radarEquation.ts snrConstant), g the
 * one-way gains relative to peak (antennaPattern.ts: axis factors multiplied, floored at the sidelobe
 * floor, zero outside the instrumented field), F⁴ the two-way knife-edge factor of the dominant
 * obstruction (ITU-R P.526-15 §4.1, eqs. 26 and 31: F² = 10^(−J(v)/10) one way), A(R) the two-way gas
 * loss (ITU-R P.676, atmosphere.ts) as a linear factor. Pd follows from the fast table (pdTable.ts).
 *
 * The hot loop does no logarithm, exponential or trigonometric call: every per-radar shape is a table
 * built once (azimuth by a pseudo-angle, elevation by sin(el), F⁴ by v, A by R), SNR in dB comes from
 * a Float32 bit pattern with a mantissa table, Pd from that SNR in dB (pdDbTable.ts). A rotating
 * radar's SNR is summed in dB (C·g_t·g_r and F⁴ tabulated in dB, the gas loss linear in R, 40·log R
 * from the bits of R²); a staring radar's is formed linearly, its gains being floored products of
 * azimuth and elevation factors, and converted once. Table errors
 * are stated beside each table and checked against the exact scalar path (coveragePoint.ts) in tests.
 * Rules CV1–CV9 in docs/model-spec.md ("Coverage").
 */
import { receiveAntenna, relativeGainDb, scanGeometry } from "./antennaPattern.ts";
import { twoWayGasLossDb } from "./atmosphere.ts";
import type { SwerlingCase } from "./detection.ts";
import type { GridFrame } from "./grid.ts";
import { cachedPdDbTable, type PdDbTable } from "./pdDbTable.ts";
import { knifeEdgeLossDb } from "./propagation.ts";
import { hashValue } from "./radarCache.ts";
import { radarEquationParams, snrConstant } from "./radarEquation.ts";
import type { AntennaSpec, RadarModel, ScanMode } from "./radarModel.ts";
import { curvatureFactorPerM, type HorizonResult } from "./terrainMask.ts";
import { dbsmToM2, dbToLinear, linearToDb, radToDeg } from "./units.ts";
import { instrumentedRangeM, wavelengthM } from "./waveform.ts";

/** Why a cell has the Pd it has, per radar, target class and height (one byte per cell). */
export const Reason = {
  /** Pd meets the requirement. */
  covered: 0,
  /** Below the sight line of the dominant obstruction, and too weak after its diffraction loss. */
  masked: 1,
  /** Beyond the maximum instrumented range (or outside the grid part the radar was computed on). */
  outOfRange: 2,
  /** Nearer than the blind zone. */
  blindZone: 3,
  /** Outside the scan sector or the instrumented field of view. */
  outOfSector: 4,
  /** In clear sight and in sector, but the SNR is too low for the required Pd. */
  tooWeak: 5,
  /** The target height is below a roof or canopy at this cell: no valid target position. */
  insideObstruction: 6,
  /** No ground or surface data here. */
  nodata: 7,
} as const;
export type Reason = (typeof Reason)[keyof typeof Reason];

/** Plain-language text of each reason code, for the app, the CLI and the report. */
export const REASON_TEXT: Readonly<Record<Reason, string>> = {
  0: "covered",
  1: "masked by terrain or buildings",
  2: "out of range",
  3: "in the blind zone",
  4: "out of sector",
  5: "too weak",
  6: "inside an obstruction",
  7: "no data",
};

/** A radar placed on the site grid, everything resolved from the plan. */
export interface PlacedRadar {
  /** Post id (unique in the plan). */
  id: string;
  /** Post name for display. */
  name: string;
  model: RadarModel;
  /** Scan mode after the post's sector override (if any). */
  scan: ScanMode;
  /** Antenna position in the grid frame, m. */
  x: number;
  y: number;
  /** Antenna height above sea level, m (ground + mast; a roof mast includes the building). */
  antennaHeightAslM: number;
  /** Boresight (sector centre) azimuth, degrees clockwise from true north. */
  boresightAzDeg: number;
  /** Beam-axis elevation, degrees, positive up. */
  tiltDeg: number;
  /** Radius around the antenna that never masks it (its own roof), m; 0 for a ground mast. */
  ownFootprintRadiusM: number;
}

/** A target class as the coverage stage needs it. */
export interface TargetSpec {
  id: string;
  /** Mean RCS, dBsm. */
  rcsDbsm: number;
  swerling: SwerlingCase;
  /** Heights above ground (m) this class is judged at; each one of the site's heights. */
  heightsAglM: readonly number[];
}

/** Detection requirement: required Pd, Pfa per cell and look, looks integrated. */
export interface DetectionRequirement {
  requiredPd: number;
  pfa: number;
  looks: number;
}

/** Everything one radar's coverage depends on besides its horizon. */
export interface RadarStageInput {
  frame: GridFrame;
  /** Ground, m ASL, row-major on the frame; NaN = nodata. */
  ground: Float32Array;
  /** Top of the building or canopy above ground per cell, m (0 on open ground). */
  obstructionTopAglM: Float32Array;
  radar: PlacedRadar;
  targets: readonly TargetSpec[];
  /** Target heights above ground, m, in the order of the outputs. */
  heightsAglM: readonly number[];
  requirement: DetectionRequirement;
  /** Effective-Earth factor k (> 0, Infinity for flat earth). */
  effectiveEarthFactor: number;
}

/** Per target class at one height. */
export interface TargetHeightCoverage {
  /** Pd per cell (0 where not computed or not detectable). Null when the class is not judged at this height. */
  pd: Float32Array | null;
  /** Reason per cell (Reason codes). Null like pd. */
  reason: Uint8Array | null;
  /**
   * The bounding rectangle of the cells with Pd > 0 (rowMin > rowMax when there is none), set by the
   * stage: fusion and metrics, which read Pd alone, skip the radar outside it. Absent: use the extent.
   */
  pdExtent?: RadarExtent;
}

/** One height of one radar. */
export interface RadarHeightCoverage {
  heightAglM: number;
  /**
   * SNR for a 1 m² (0 dBsm) target, dB; a class of σ dBsm has SNR = this + σ. NaN where not computed
   * (out of range, blind zone, not instrumented, inside an obstruction, nodata).
   */
  snrDbAt0Dbsm: Float32Array;
  /** Per target class, in the order of the input targets. */
  targets: TargetHeightCoverage[];
}

/**
 * The rows and columns (inclusive) of the square a radar stage visited; every cell outside it is out
 * of range in every output (SNR and lowest height NaN, Pd 0, reason outOfRange).
 */
export interface RadarExtent {
  rowMin: number;
  rowMax: number;
  colMin: number;
  colMax: number;
}

/** The coverage of one radar: per height, per target class. */
export interface RadarCoverage {
  radarId: string;
  heightsAglM: number[];
  targetIds: string[];
  /** Lowest visible target height above ground per cell, m (NaN nodata / out of range); from the horizon. */
  lowestVisibleHeightAglM: Float32Array;
  heights: RadarHeightCoverage[];
  /**
   * The square the stage visited (absent: the whole grid may hold values). Fusion and metrics skip the
   * radar outside it; a later stage writing into these arrays refills only what changed around it.
   */
  extent?: RadarExtent;
}

/** Instrumented ranges of a radar, m (slant range). */
export function radarRangeWindowM(model: RadarModel): { minM: number; maxM: number } {
  return instrumentedRangeM(model);
}

// ---------------------------------------------------------------------------------------------
// Per-radar tables. They stay in this module beside the loops that read them: moved to a module of
// their own, the rotating stage ran 4–10 % slower in interleaved runs (Node 20, 3 December 2026).

/** Azimuth table bins over the pseudo-angle [0, 4): ≤ 0.011° per bin (90°/8192·√2), nearest bin. */
const AZ_BINS = 32768;
/** Elevation table bins over sin(el) in [−1, 1]: 2/8192 → ≤ 0.014° per bin near the horizon, nearest bin. */
const EL_BINS = 8193;
/** Knife-edge table: v from V_MIN (J = 0 below, ITU-R P.526 eq. 31) to V_MAX, step 0.005 (J' ≤ 8.7 dB per unit v → ≤ 0.022 dB one way). */
const V_MIN = -0.78;
const V_MAX = 60;
const V_STEP = 0.005;
/** Gas-loss table bins over [0, max range]: the loss is linear in R and tiny per bin. */
const GAS_BINS = 4096;
/** log2 mantissa table for SNR in dB from Float32 bits: 1024 bins → ≤ 0.0021 dB (10·log10(1 + 1/1024)/2). */
const LOG_MANTISSA_BITS = 10;
const F32_MANTISSA_BITS = 23;
const F32_EXPONENT_BIAS = 127;
const DB_PER_LOG2 = linearToDb(2);
/** log2 mantissa table for 20·log10(R²) from Float32 bits: 4096 bins → ≤ 0.0011 dB (20·log10(1 + 1/4096)/2). */
const LOG_MANTISSA_BITS_R2 = 12;

const LOG2_MANTISSA = (() => {
  const n = 1 << LOG_MANTISSA_BITS;
  const t = new Float32Array(n);
  // Centre of each bin of 1 + m/n.
  for (let j = 0; j < n; j++) t[j] = Math.log2(1 + (j + 0.5) / n);
  return t;
})();

const LOG2_MANTISSA_R2 = (() => {
  const n = 1 << LOG_MANTISSA_BITS_R2;
  const t = new Float32Array(n);
  for (let j = 0; j < n; j++) t[j] = Math.log2(1 + (j + 0.5) / n);
  return t;
})();

/** The per-radar constants and tables of the hot loop. Plain data: it can be posted to a worker. */
export interface RadarKernel {
  /** SNR·m⁴ of a 1 m² target at peak gains, free space, no gas loss (snrConstant). */
  snrConstantM4: number;
  minRangeM: number;
  maxRangeM: number;
  wavelengthM: number;
  curvaturePerM: number;
  /** One-way azimuth factors (tx, rx) over the pseudo-angle; −1 where not instrumented. 1 bin for rotating. */
  azTx: Float32Array;
  azRx: Float32Array;
  /** 1 where the azimuth lies inside the nominal sector. */
  azInSector: Uint8Array;
  /** One-way elevation factors (tx, rx) over sin(el); −1 outside the elevation field of view. */
  elTx: Float32Array;
  elRx: Float32Array;
  /** Sidelobe floors, linear (one way). */
  floorTx: number;
  floorRx: number;
  /** F⁴ (two way) over v, and the same in dB (−2·J(v)). */
  knifeEdgeF4: Float32Array;
  knifeEdgeF4Db: Float32Array;
  /** Two-way gas-loss factor over R in [0, maxRangeM]. */
  gasFactor: Float32Array;
  /** Two-way gas loss per metre of slant range, dB/m. */
  gasLossDbPerM: number;
  /** Pd-by-dB tables per target class, and the RCS in m² and dBsm. */
  pdTables: PdDbTable[];
  rcsM2: number[];
  rcsDbsm: number[];
  requiredPd: number;
}

/** Bearing (degrees clockwise from north) at the centre of pseudo-angle bin j. */
function pseudoAngleBinBearingDeg(j: number): number {
  const p = ((j + 0.5) * 4) / AZ_BINS;
  const q = Math.floor(p);
  const t = p - q;
  return q * 90 + radToDeg(Math.atan2(t, 1 - t));
}

/**
 * Pseudo-angle bin of a direction (east, north components), monotone in bearing: 0 at north,
 * one quarter of the bins per quadrant, t = |component| / (|east| + |north|) inside a quadrant.
 */
export function pseudoAngleBin(east: number, north: number): number {
  const ae = east < 0 ? -east : east;
  const an = north < 0 ? -north : north;
  const s = ae + an;
  if (!(s > 0)) return 0;
  let p: number;
  if (east >= 0) p = north > 0 ? ae / s : 1 + an / s;
  else p = north < 0 ? 2 + ae / s : 3 + an / s;
  const j = (p * (AZ_BINS / 4)) | 0;
  return j < AZ_BINS ? j : AZ_BINS - 1;
}

/** One-way axis factor of an antenna for the tables: the pattern along one axis, floored, linear. */
function axisFactorLinear(antenna: AntennaSpec, azOffDeg: number, elOffDeg: number): number {
  return dbToLinear(relativeGainDb(antenna, azOffDeg, elOffDeg));
}

/**
 * Builds the per-radar constants and tables (tens of milliseconds, dominated by the Pd tables on first
 * use). The two-way gain is g_t·g_r with g = max(f_az·f_el, floor): the axis factors are tabulated
 * separately, each floored, which gives the same g (a factor below the floor floors the product).
 */
export function buildRadarKernel(input: {
  radar: PlacedRadar;
  targets: readonly TargetSpec[];
  requirement: DetectionRequirement;
  effectiveEarthFactor: number;
}): RadarKernel {
  const { radar, targets, requirement } = input;
  const model = radar.model;
  const tx = model.txAntenna;
  const rx = receiveAntenna(model);
  const pointing = { scan: radar.scan, boresightAzDeg: radar.boresightAzDeg, tiltDeg: radar.tiltDeg };
  const { minM, maxM } = radarRangeWindowM(model);

  const rotating = radar.scan.kind === "rotating";
  const azBins = rotating ? 1 : AZ_BINS;
  const azTx = new Float32Array(azBins);
  const azRx = new Float32Array(azBins);
  const azInSector = new Uint8Array(azBins);
  for (let j = 0; j < azBins; j++) {
    const bearing = rotating ? radar.boresightAzDeg : pseudoAngleBinBearingDeg(j);
    const geo = scanGeometry(pointing, bearing, radar.tiltDeg);
    if (!geo.instrumented) {
      azTx[j] = -1;
      azRx[j] = -1;
      continue;
    }
    azTx[j] = axisFactorLinear(tx, geo.patternAzOffDeg, 0);
    azRx[j] = axisFactorLinear(rx, geo.patternAzOffDeg, 0);
    azInSector[j] = geo.inSector ? 1 : 0;
  }

  const elTx = new Float32Array(EL_BINS);
  const elRx = new Float32Array(EL_BINS);
  for (let m = 0; m < EL_BINS; m++) {
    const sinEl = (2 * m) / (EL_BINS - 1) - 1;
    const elDeg = radToDeg(Math.asin(Math.max(-1, Math.min(1, sinEl))));
    const geo = scanGeometry(pointing, radar.boresightAzDeg, elDeg);
    if (!geo.instrumented) {
      elTx[m] = -1;
      elRx[m] = -1;
      continue;
    }
    elTx[m] = axisFactorLinear(tx, 0, geo.elOffDeg);
    elRx[m] = axisFactorLinear(rx, 0, geo.elOffDeg);
  }

  const vBins = Math.round((V_MAX - V_MIN) / V_STEP) + 1;
  const knifeEdgeF4 = new Float32Array(vBins);
  const knifeEdgeF4Db = new Float32Array(vBins);
  for (let b = 0; b < vBins; b++) {
    const f4Db = -2 * knifeEdgeLossDb(V_MIN + b * V_STEP);
    knifeEdgeF4Db[b] = f4Db;
    knifeEdgeF4[b] = dbToLinear(f4Db);
  }

  const gasAt1Km = twoWayGasLossDb({ frequencyHz: model.frequencyHz, rangeM: 1000 });
  // Below 1 GHz P.676 is not evaluated (atmosphere.ts returns NaN) and the loss is negligible: 0.
  const gasLossDbPerM = Number.isFinite(gasAt1Km) ? gasAt1Km / 1000 : 0;
  const gasFactor = new Float32Array(GAS_BINS + 1);
  const gasStepM = maxM / GAS_BINS;
  for (let b = 0; b <= GAS_BINS; b++) gasFactor[b] = dbToLinear(-gasLossDbPerM * (b + 0.5) * gasStepM);

  const c = snrConstant(radarEquationParams(model, { rcsM2: 1 }));
  return {
    snrConstantM4: c,
    minRangeM: minM,
    maxRangeM: maxM,
    wavelengthM: wavelengthM(model.frequencyHz),
    curvaturePerM: curvatureFactorPerM(input.effectiveEarthFactor),
    azTx,
    azRx,
    azInSector,
    elTx,
    elRx,
    floorTx: dbToLinear(tx.sidelobeFloorDb),
    floorRx: dbToLinear(rx.sidelobeFloorDb),
    knifeEdgeF4,
    knifeEdgeF4Db,
    gasFactor,
    gasLossDbPerM,
    pdTables: targets.map((t) => cachedPdDbTable(requirement.pfa, requirement.looks, t.swerling)),
    rcsM2: targets.map((t) => dbsmToM2(t.rcsDbsm)),
    rcsDbsm: targets.map((t) => t.rcsDbsm),
    requiredPd: requirement.requiredPd,
  };
}

/** Kernels built lately, by what they depend on (see kernelFor). */
const kernels = new Map<string, RadarKernel>();
const KERNELS_KEPT = 32;

/**
 * buildRadarKernel, or the same kernel built before for the same model, scan, pointing, classes,
 * requirement and k: a kernel does not depend on where the radar stands or how high, so a post that
 * is moved again and again (a drag, its release) reuses it (a few ms of pattern and loss tables each).
 */
export function kernelFor(input: Parameters<typeof buildRadarKernel>[0]): RadarKernel {
  const { radar } = input;
  const key = hashValue({
    model: radar.model,
    scan: radar.scan,
    boresightAzDeg: radar.boresightAzDeg,
    tiltDeg: radar.tiltDeg,
    targets: input.targets.map((t) => [t.rcsDbsm, t.swerling]),
    requirement: input.requirement,
    k: input.effectiveEarthFactor,
  });
  let kernel = kernels.get(key);
  if (kernel === undefined) {
    kernel = buildRadarKernel(input);
    if (kernels.size >= KERNELS_KEPT) kernels.delete(kernels.keys().next().value as string);
  } else kernels.delete(key);
  kernels.set(key, kernel);
  return kernel;
}

/**
 * Allocate the outputs of one radar, zeroed. The radar stage writes every cell: inside the square it
 * visits cell by cell, outside it with fills (reason out of range, SNR and lowest height NaN).
 */
/** What a radar result's shape follows from: its grid, its radar, the heights and the classes. */
export type RadarShapeInput = Pick<RadarStageInput, "frame" | "radar" | "heightsAglM" | "targets">;

/**
 * A result of the shape the radar stage gives for `input`, its arrays allocated and zeroed and not
 * yet written: memory to prepare ahead of a run (see RadarResultCache spares).
 */
export function blankRadarCoverage(input: RadarShapeInput): RadarCoverage {
  return allocateCoverage(input);
}

function allocateCoverage(input: RadarShapeInput, reuse?: RadarCoverage): RadarCoverage {
  const n = input.frame.width * input.frame.height;
  if (reuse !== undefined && fitsShape(reuse, input, n)) {
    reuse.radarId = input.radar.id;
    return reuse;
  }
  return {
    radarId: input.radar.id,
    heightsAglM: [...input.heightsAglM],
    targetIds: input.targets.map((t) => t.id),
    lowestVisibleHeightAglM: new Float32Array(n),
    heights: input.heightsAglM.map((h) => ({
      heightAglM: h,
      snrDbAt0Dbsm: new Float32Array(n),
      targets: input.targets.map((t) =>
        t.heightsAglM.includes(h)
          ? { pd: new Float32Array(n), reason: new Uint8Array(n) }
          : { pd: null, reason: null },
      ),
    })),
  };
}

/** Whether a previous result has exactly the arrays this input needs (same cells, heights, classes). */
function fitsShape(r: RadarCoverage, input: RadarShapeInput, n: number): boolean {
  if (r.lowestVisibleHeightAglM.length !== n || r.heights.length !== input.heightsAglM.length) return false;
  return (
    r.heights.every(
      (hc, k) =>
        hc.heightAglM === input.heightsAglM[k] &&
        hc.snrDbAt0Dbsm.length === n &&
        hc.targets.length === input.targets.length &&
        hc.targets.every(
          (tc, t) => (tc.pd !== null) === input.targets[t].heightsAglM.includes(hc.heightAglM),
        ),
    ) && r.targetIds.every((id, t) => id === input.targets[t]?.id)
  );
}

/**
 * Where the stage writes a class at a height the class is not judged at (its values are never read):
 * kept for the next call in this thread, as a part of a run split over workers has such pairs in every
 * call and 5 bytes per cell of new memory cost their first write and a collection each time.
 */
let sinkArrays: { pd: Float32Array; reason: Uint8Array } | null = null;
function stageSink(n: number): { pd: Float32Array; reason: Uint8Array } {
  if (sinkArrays?.pd.length !== n) sinkArrays = { pd: new Float32Array(n), reason: new Uint8Array(n) };
  return sinkArrays;
}

/** Mark [from, to) as outside the radar's range in every output. */
function fillOutside(
  from: number,
  to: number,
  lowest: Float32Array,
  snrOut: Float32Array[],
  pdOut: Float32Array[],
  reasonOut: Uint8Array[],
): void {
  if (to <= from) return;
  lowest.fill(Number.NaN, from, to);
  for (const a of snrOut) a.fill(Number.NaN, from, to);
  for (const a of pdOut) a.fill(0, from, to);
  for (const a of reasonOut) a.fill(Reason.outOfRange, from, to);
}

/**
 * Everything one row of the radar stage reads: the per-radar constants and tables, the inputs and
 * the outputs (radarCoverageFromHorizon builds it once per call; the row functions read it once per row).
 */
interface StageRowContext {
  w: number;
  cellM: number;
  oc: number;
  orow: number;
  c0: number;
  c1: number;
  maxR: number;
  nh: number;
  nq: number;
  nt: number;
  H: number;
  curv: number;
  twoOverLambda: number;
  minR2: number;
  maxR2: number;
  elScale: number;
  floorTx: number;
  floorRx: number;
  vScale: number;
  vLast: number;
  C: number;
  gasScale: number;
  gasDbPerM: number;
  requiredPd: number;
  ground: Float32Array;
  hs: Float32Array;
  od: Float32Array;
  obstructionTopAglM: Float32Array;
  lowest: Float32Array;
  snrOut: Float32Array[];
  pdOut: Float32Array[];
  reasonOut: Uint8Array[];
  heights: Float64Array;
  azTx: Float32Array;
  azRx: Float32Array;
  azInSector: Uint8Array;
  elTx: Float32Array;
  elRx: Float32Array;
  knifeEdgeF4: Float32Array;
  knifeEdgeF4Db: Float32Array;
  gasFactor: Float32Array;
  f32: Float32Array;
  u32: Uint32Array;
  /** Per class: RCS (dBsm) and its Pd-by-dB table's fields (pdDbTable.ts). */
  rcsDb: Float64Array;
  pdLowDb: Float64Array;
  pdPerDb: Float64Array;
  pdLast: Int32Array;
  pdPfa: Float64Array;
  pdHigh: Float64Array;
  pdValues: Float32Array[];
  /** The first class's fields again (the only class in most plans), for the one-class paths. */
  rcsDb0: number;
  pdLowDb0: number;
  pdPerDb0: number;
  pdLast0: number;
  pdPfa0: number;
  pdHigh0: number;
  pdValues0: Float32Array;
  /** Rotating radar: 10·log10(C·g_t·g_r) per elevation bin, −Infinity outside the elevation field. */
  cGainDb: Float64Array;
  /** Row scratch: horizontal distance by |column offset|, m. */
  dRow: Float64Array;
}

/** Fills dRow with the horizontal distance of each |column offset| on this row (rule TM1's distance). */
function fillRowDistances(s: StageRowContext, row: number): void {
  const { cellM, oc, orow, c0, c1, dRow } = s;
  const dy2 = (row - orow) * (row - orow);
  const dxMax = Math.max(oc - c0, c1 - oc);
  // cellM·√(dx² + dy²) as terrainMask.ts defines it; one square root serves both sides of the radar.
  for (let dx = 0; dx <= dxMax; dx++) dRow[dx] = cellM * Math.sqrt(dx * dx + dy2);
}

/**
 * One row of the radar stage for a staring radar (cells c0..c1). A function of its own so that V8
 * optimises it as a whole and keeps that code from call to call (a loop inside the caller is compiled
 * on stack replacement, dropped when the code after the loop deoptimises, and recompiled on every
 * call). Its twin for rotating radars is stageRowRotating: a change to the shared steps reaches both.
 */
function stageRow(s: StageRowContext, row: number): void {
  const { w, cellM, oc, orow, c0, c1, maxR, nh, nq, nt, H, curv, twoOverLambda, minR2, maxR2 } = s;
  const { elScale, floorTx, floorRx, vScale, vLast, C, gasScale, requiredPd } = s;
  const { ground, hs, od, obstructionTopAglM, lowest, snrOut, pdOut, reasonOut, heights } = s;
  const { azTx, azRx, azInSector, elTx, elRx, knifeEdgeF4, gasFactor, f32, u32, dRow } = s;
  const { rcsDb, pdLowDb, pdPerDb, pdLast, pdPfa, pdHigh, pdValues } = s;
  const { rcsDb0, pdLowDb0, pdPerDb0, pdLast0, pdPfa0, pdHigh0, pdValues0 } = s;
  const log2Mantissa = LOG2_MANTISSA;
  const mantShift = F32_MANTISSA_BITS - LOG_MANTISSA_BITS;
  const mantMask = (1 << LOG_MANTISSA_BITS) - 1;
  const dbPerLog2 = DB_PER_LOG2;
  const vMin = V_MIN;
  const expBias = F32_EXPONENT_BIAS;
  const expShift = F32_MANTISSA_BITS;
  const negInf = Number.NEGATIVE_INFINITY;
  const rCovered = Reason.covered;
  const rMasked = Reason.masked;
  const rOutOfRange = Reason.outOfRange;
  const rBlindZone = Reason.blindZone;
  const rOutOfSector = Reason.outOfSector;
  const rTooWeak = Reason.tooWeak;
  const rInside = Reason.insideObstruction;
  const rNodata = Reason.nodata;
  const northM = (orow - row) * cellM;
  fillRowDistances(s, row);
  for (let col = c0; col <= c1; col++) {
    const i = row * w + col;
    const d = dRow[col < oc ? oc - col : col - oc];
    const g = ground[i];
    const sigma = hs[i];
    if (!(d <= maxR) || Number.isNaN(g) || Number.isNaN(sigma)) {
      // No ground: nodata. Ground but no horizon: beyond the sweep's range limit (its own distance
      // test at the edge), so out of range like the cells beyond maxR.
      const code = Number.isNaN(g) ? rNodata : rOutOfRange;
      lowest[i] = Number.NaN;
      for (let k = 0; k < nh; k++) snrOut[k][i] = Number.NaN;
      for (let q = 0; q < nq; q++) {
        pdOut[q][i] = 0;
        reasonOut[q][i] = code;
      }
      continue;
    }
    // Azimuth factors (height-independent).
    const j = pseudoAngleBin((col - oc) * cellM, northM);
    const aTx = azTx[j];
    const aRx = azRx[j];
    const inSectorAz = azInSector[j];
    const d2 = d * d;
    const base = g - H - d2 * curv;
    // Lowest visible height (terrainMask.ts rule TM5): −base + σ·d, at least 0; 0 where nothing obstructs.
    lowest[i] = sigma === negInf ? 0 : Math.max(0, sigma * d - base);
    const top = obstructionTopAglM[i];
    if (aTx < 0) {
      // Outside the instrumented azimuths: only the reason differs by height (the codes that come
      // before "out of sector"), with no gain or knife-edge work.
      for (let k = 0; k < nh; k++) {
        const h = heights[k];
        const dh = base + h;
        const R2 = d2 + dh * dh;
        let code: number = rOutOfSector;
        if (top > h) code = rInside;
        else if (R2 < minR2 || R2 === 0) code = rBlindZone;
        else if (R2 > maxR2) code = rOutOfRange;
        snrOut[k][i] = Number.NaN;
        const q0 = k * nt;
        for (let t = 0; t < nt; t++) {
          pdOut[q0 + t][i] = 0;
          reasonOut[q0 + t][i] = code;
        }
      }
      continue;
    }
    // Knife edge: v = Kv·s·(σ − Δh/d), Kv = √((2/λ)(1/s + 1/(d − s))); so v = va − vb·Δh.
    let va = -1e30;
    let vb = 0;
    if (sigma !== negInf) {
      const sd = od[i];
      const rest = d - sd > 0 ? d - sd : cellM * 0.5;
      const kv = Math.sqrt(twoOverLambda * (1 / sd + 1 / rest));
      va = kv * sd * sigma;
      vb = (kv * sd) / d;
    }
    for (let k = 0; k < nh; k++) {
      const h = heights[k];
      const q0 = k * nt;
      const dh = base + h;
      const R2 = d2 + dh * dh;
      let code = -1;
      if (top > h) code = rInside;
      else if (R2 < minR2 || R2 === 0) code = rBlindZone;
      else if (R2 > maxR2) code = rOutOfRange;
      let cg = -1;
      let invR = 0;
      if (code < 0) {
        invR = 1 / Math.sqrt(R2);
        const m = (dh * invR * elScale + elScale + 0.5) | 0;
        const eTx = elTx[m];
        if (eTx >= 0) {
          let gt = aTx * eTx;
          if (gt < floorTx) gt = floorTx;
          let gr = aRx * elRx[m];
          if (gr < floorRx) gr = floorRx;
          cg = C * gt * gr;
        } else code = rOutOfSector;
      }
      if (code >= 0) {
        snrOut[k][i] = Number.NaN;
        for (let t = 0; t < nt; t++) {
          pdOut[q0 + t][i] = 0;
          reasonOut[q0 + t][i] = code;
        }
        continue;
      }
      const v = va - vb * dh;
      let f4 = 1;
      if (v > vMin) {
        const b = ((v - vMin) * vScale + 0.5) | 0;
        f4 = knifeEdgeF4[Math.min(b, vLast)];
      }
      const invR2 = invR * invR;
      const snr = cg * f4 * gasFactor[(R2 * invR * gasScale) | 0] * invR2 * invR2;
      f32[0] = snr;
      const bits = u32[0];
      const snrDb =
        snr > 0
          ? dbPerLog2 * ((bits >>> expShift) - expBias + log2Mantissa[(bits >>> mantShift) & mantMask])
          : negInf;
      snrOut[k][i] = snrDb;
      const weakCode = inSectorAz === 0 ? rOutOfSector : v > 0 ? rMasked : rTooWeak;
      if (nt === 1) {
        // One class (the common case): its table fields in locals (pdDbTable.ts pdFromSnrDb inline).
        const x = snrDb + rcsDb0;
        const pos = (x - pdLowDb0) * pdPerDb0;
        let pd: number;
        if (pos >= 0 && pos < pdLast0) {
          const jj = pos | 0;
          const a = pdValues0[jj];
          pd = a + (pos - jj) * (pdValues0[jj + 1] - a);
        } else pd = pos >= pdLast0 ? pdHigh0 : x > negInf ? pdPfa0 : 0;
        pdOut[q0][i] = pd;
        reasonOut[q0][i] = pd >= requiredPd ? rCovered : weakCode;
        continue;
      }
      for (let t = 0; t < nt; t++) {
        const x = snrDb + rcsDb[t];
        const pos = (x - pdLowDb[t]) * pdPerDb[t];
        const last = pdLast[t];
        let pd: number;
        if (pos >= 0 && pos < last) {
          const vals = pdValues[t];
          const jj = pos | 0;
          const a = vals[jj];
          pd = a + (pos - jj) * (vals[jj + 1] - a);
        } else pd = pos >= last ? pdHigh[t] : x > negInf ? pdPfa[t] : 0;
        pdOut[q0 + t][i] = pd;
        reasonOut[q0 + t][i] = pd >= requiredPd ? rCovered : weakCode;
      }
    }
  }
}

/**
 * One row of the radar stage for a rotating radar, the costly case (every cell of its square is in
 * azimuth and in sector). The azimuth factors are 1, so the SNR is a sum in dB: the per-call table
 * 10·log10(C·g_t·g_r) by elevation bin, F⁴ in dB by v, minus the gas loss (exact, linear in R) and
 * 20·log10(R²) from the Float32 bits of R². Twin of stageRow: a change to the shared steps reaches both.
 */
function stageRowRotating(s: StageRowContext, row: number): void {
  const { w, cellM, oc, c0, c1, maxR, nh, nt, H, curv, twoOverLambda, minR2, maxR2, elScale } = s;
  const { vScale, vLast, gasDbPerM, requiredPd } = s;
  const { ground, hs, od, obstructionTopAglM, lowest, snrOut, pdOut, reasonOut, heights } = s;
  const { knifeEdgeF4Db, f32, u32, cGainDb, dRow } = s;
  const { rcsDb, pdLowDb, pdPerDb, pdLast, pdPfa, pdHigh, pdValues } = s;
  const { rcsDb0, pdLowDb0, pdPerDb0, pdLast0, pdPfa0, pdHigh0, pdValues0 } = s;
  const log2Mantissa = LOG2_MANTISSA_R2;
  const mantShift = F32_MANTISSA_BITS - LOG_MANTISSA_BITS_R2;
  const mantMask = (1 << LOG_MANTISSA_BITS_R2) - 1;
  const dbPerLog2R2 = 2 * DB_PER_LOG2;
  const vMin = V_MIN;
  const expBias = F32_EXPONENT_BIAS;
  const expShift = F32_MANTISSA_BITS;
  const negInf = Number.NEGATIVE_INFINITY;
  const rCovered = Reason.covered;
  const rMasked = Reason.masked;
  const rOutOfRange = Reason.outOfRange;
  const rBlindZone = Reason.blindZone;
  const rOutOfSector = Reason.outOfSector;
  const rTooWeak = Reason.tooWeak;
  const rInside = Reason.insideObstruction;
  const rNodata = Reason.nodata;
  fillRowDistances(s, row);
  for (let col = c0; col <= c1; col++) {
    const i = row * w + col;
    const d = dRow[col < oc ? oc - col : col - oc];
    const g = ground[i];
    const sigma = hs[i];
    if (!(d <= maxR) || Number.isNaN(g) || Number.isNaN(sigma)) {
      // As in stageRow: nodata without ground, else out of range.
      const code = Number.isNaN(g) ? rNodata : rOutOfRange;
      lowest[i] = Number.NaN;
      for (let k = 0; k < nh; k++) {
        snrOut[k][i] = Number.NaN;
        for (let t = 0; t < nt; t++) {
          pdOut[k * nt + t][i] = 0;
          reasonOut[k * nt + t][i] = code;
        }
      }
      continue;
    }
    const d2 = d * d;
    const base = g - H - d2 * curv;
    lowest[i] = sigma === negInf ? 0 : Math.max(0, sigma * d - base);
    const top = obstructionTopAglM[i];
    // Knife edge as in stageRow: v = va − vb·Δh.
    let va = -1e30;
    let vb = 0;
    if (sigma !== negInf) {
      const sd = od[i];
      const rest = d - sd > 0 ? d - sd : cellM * 0.5;
      const kv = Math.sqrt(twoOverLambda * (1 / sd + 1 / rest));
      va = kv * sd * sigma;
      vb = (kv * sd) / d;
    }
    for (let k = 0; k < nh; k++) {
      const h = heights[k];
      const q0 = k * nt;
      const dh = base + h;
      const R2 = d2 + dh * dh;
      let code = -1;
      let cgDb = negInf;
      let R = 0;
      if (top > h) code = rInside;
      else if (R2 < minR2 || R2 === 0) code = rBlindZone;
      else if (R2 > maxR2) code = rOutOfRange;
      else {
        R = Math.sqrt(R2);
        cgDb = cGainDb[((dh / R) * elScale + elScale + 0.5) | 0];
        if (cgDb === negInf) code = rOutOfSector;
      }
      if (code >= 0) {
        snrOut[k][i] = Number.NaN;
        for (let t = 0; t < nt; t++) {
          pdOut[q0 + t][i] = 0;
          reasonOut[q0 + t][i] = code;
        }
        continue;
      }
      const v = va - vb * dh;
      let f4Db = 0;
      if (v > vMin) {
        const b = ((v - vMin) * vScale + 0.5) | 0;
        f4Db = knifeEdgeF4Db[Math.min(b, vLast)];
      }
      f32[0] = R2;
      const bits = u32[0];
      const snrDb =
        cgDb +
        f4Db -
        gasDbPerM * R -
        dbPerLog2R2 * ((bits >>> expShift) - expBias + log2Mantissa[(bits >>> mantShift) & mantMask]);
      snrOut[k][i] = snrDb;
      const weakCode = v > 0 ? rMasked : rTooWeak;
      if (nt === 1) {
        const x = snrDb + rcsDb0;
        const pos = (x - pdLowDb0) * pdPerDb0;
        let pd: number;
        if (pos >= 0 && pos < pdLast0) {
          const jj = pos | 0;
          const a = pdValues0[jj];
          pd = a + (pos - jj) * (pdValues0[jj + 1] - a);
        } else pd = pos >= pdLast0 ? pdHigh0 : x > negInf ? pdPfa0 : 0;
        pdOut[q0][i] = pd;
        reasonOut[q0][i] = pd >= requiredPd ? rCovered : weakCode;
        continue;
      }
      for (let t = 0; t < nt; t++) {
        const x = snrDb + rcsDb[t];
        const pos = (x - pdLowDb[t]) * pdPerDb[t];
        const last = pdLast[t];
        let pd: number;
        if (pos >= 0 && pos < last) {
          const vals = pdValues[t];
          const jj = pos | 0;
          const a = vals[jj];
          pd = a + (pos - jj) * (vals[jj + 1] - a);
        } else pd = pos >= last ? pdHigh[t] : x > negInf ? pdPfa[t] : 0;
        pdOut[q0 + t][i] = pd;
        reasonOut[q0 + t][i] = pd >= requiredPd ? rCovered : weakCode;
      }
    }
  }
}

/**
 * The radar stage: SNR, Pd and reason per cell for every height and target class, from the radar's
 * horizon (computeHorizon on the obstruction surface, same frame). Only the square around the radar
 * within its maximum instrumented range is visited; the rest stays "out of range".
 * Inputs as RadarStageInput (m, dBsm, degrees); kernel from buildRadarKernel for the same radar.
 * Output: a RadarCoverage. A NaN ground or horizon gives "nodata"; a target below the roof top
 * "inside an obstruction"; slant range below the blind zone "blind zone", above the maximum "out of
 * range"; outside the instrumented field "out of sector"; then Pd decides: covered, else masked when
 * the sight line is obstructed (v > 0), else too weak; beyond a sector edge "out of sector".
 * `reuse`: a previous result of the same shape (cells, heights, classes) to overwrite instead of
 * allocating; ignored when the shape differs. Every cell is rewritten, except that when the reused
 * result's `extent` lies inside this radar's square its outside (already "out of range" there) is
 * left as it is: do not change a result's arrays outside its extent.
 */
export function radarCoverageFromHorizon(
  input: RadarStageInput,
  kernel: RadarKernel,
  horizon: HorizonResult,
  reuse?: RadarCoverage,
): RadarCoverage {
  const { frame, ground, obstructionTopAglM, radar } = input;
  const out = allocateCoverage(input, reuse);
  const lowest = out.lowestVisibleHeightAglM;
  const w = frame.width;
  const hgt = frame.height;
  const cellM = frame.cellSizeM;
  const H = radar.antennaHeightAslM;
  const oc = horizon.observerCol;
  const orow = horizon.observerRow;
  const heights = Float64Array.from(input.heightsAglM);
  const nh = heights.length;
  // Flat lists over (height, target) so the loop indexes one array; classes not judged at a height
  // write into shared scratch arrays, which keeps the loop monomorphic.
  const n = w * hgt;
  const snrOut: Float32Array[] = out.heights.map((hc) => hc.snrDbAt0Dbsm);
  const pdOut: Float32Array[] = [];
  const reasonOut: Uint8Array[] = [];
  for (const hc of out.heights)
    for (const tc of hc.targets) {
      if (tc.pd === null || tc.reason === null) {
        const sink = stageSink(n);
        pdOut.push(sink.pd);
        reasonOut.push(sink.reason);
      } else {
        pdOut.push(tc.pd);
        reasonOut.push(tc.reason);
      }
    }
  const nq = reasonOut.length;
  const {
    snrConstantM4: C,
    azTx,
    azRx,
    azInSector,
    elTx,
    elRx,
    floorTx,
    floorRx,
    knifeEdgeF4,
    gasFactor,
    curvaturePerM: curv,
    requiredPd,
  } = kernel;
  const nt = input.targets.length;
  // Pd-by-dB tables unpacked per class (pdDbTable.ts layout).
  const tables = kernel.pdTables;
  const rcsDb = Float64Array.from(kernel.rcsDbsm);
  const pdLowDb = Float64Array.from(tables, (t) => t.lowDb);
  const pdPerDb = Float64Array.from(tables, (t) => t.nodesPerDb);
  const pdLast = Int32Array.from(tables, (t) => t.values.length - 1);
  const pdPfa = Float64Array.from(tables, (t) => t.pfa);
  const pdHigh = Float64Array.from(tables, (t) => t.pdHigh);
  const pdValues = tables.map((t) => t.values);
  const minR2 = kernel.minRangeM * kernel.minRangeM;
  const maxR = kernel.maxRangeM;
  const maxR2 = maxR * maxR;
  const rotating = azTx.length === 1;
  const f32 = new Float32Array(1);
  const u32 = new Uint32Array(f32.buffer);

  const spanCells = Number.isFinite(maxR) ? Math.ceil(maxR / cellM) + 1 : Math.max(w, hgt);
  const r0 = Math.max(0, orow - spanCells);
  const r1 = Math.min(hgt - 1, orow + spanCells);
  const c0 = Math.max(0, oc - spanCells);
  const c1 = Math.min(w - 1, oc + spanCells);

  // Outside the square every output is "out of range". A reused result already holds exactly that
  // outside its own square (its stage filled it), so only the part of its square outside this one is
  // filled then; otherwise the whole outside is filled here.
  const old = reuse !== undefined && out === reuse ? reuse.extent : undefined;
  out.extent = undefined; // while being written, the arrays match no extent
  // Rotating: the azimuth factors are 1, so C·g_t·g_r depends on the elevation bin alone (in dB).
  const cGainDb = new Float64Array(rotating ? elTx.length : 0);
  for (let m = 0; m < cGainDb.length; m++) {
    const eTx = elTx[m];
    if (eTx < 0) {
      cGainDb[m] = Number.NEGATIVE_INFINITY;
      continue;
    }
    let gt = eTx;
    if (gt < floorTx) gt = floorTx;
    let gr = elRx[m];
    if (gr < floorRx) gr = floorRx;
    cGainDb[m] = linearToDb(C * gt * gr);
  }
  const t0 = nt > 0 ? 0 : -1;
  const ctx: StageRowContext = {
    w,
    cellM,
    oc,
    orow,
    c0,
    c1,
    maxR,
    nh,
    nq,
    nt,
    H,
    curv,
    twoOverLambda: 2 / kernel.wavelengthM,
    minR2,
    maxR2,
    elScale: (EL_BINS - 1) / 2,
    floorTx,
    floorRx,
    vScale: 1 / V_STEP,
    vLast: knifeEdgeF4.length - 1,
    C,
    gasScale: GAS_BINS / maxR,
    gasDbPerM: kernel.gasLossDbPerM,
    requiredPd,
    ground,
    hs: horizon.horizonSlope,
    od: horizon.obstacleDistanceM,
    obstructionTopAglM,
    lowest,
    snrOut,
    pdOut,
    reasonOut,
    heights,
    azTx,
    azRx,
    azInSector,
    elTx,
    elRx,
    knifeEdgeF4,
    knifeEdgeF4Db: kernel.knifeEdgeF4Db,
    gasFactor,
    f32,
    u32,
    rcsDb,
    pdLowDb,
    pdPerDb,
    pdLast,
    pdPfa,
    pdHigh,
    pdValues,
    rcsDb0: t0 < 0 ? 0 : rcsDb[t0],
    pdLowDb0: t0 < 0 ? 0 : pdLowDb[t0],
    pdPerDb0: t0 < 0 ? 0 : pdPerDb[t0],
    pdLast0: t0 < 0 ? 0 : pdLast[t0],
    pdPfa0: t0 < 0 ? 0 : pdPfa[t0],
    pdHigh0: t0 < 0 ? 0 : pdHigh[t0],
    pdValues0: t0 < 0 ? new Float32Array(2) : pdValues[t0],
    cGainDb,
    dRow: new Float64Array(Math.max(oc - c0, c1 - oc) + 1),
  };
  // Of the rows and columns [f0, f1] × [g0, g1] that may hold anything but "out of range", those
  // outside this square are filled.
  const f0 = old === undefined ? 0 : old.rowMin;
  const f1 = old === undefined ? hgt - 1 : old.rowMax;
  const g0 = old === undefined ? 0 : old.colMin;
  const g1 = old === undefined ? w - 1 : old.colMax;
  const outs = [lowest, snrOut, pdOut, reasonOut] as const;
  for (let row = f0; row <= f1; row++) {
    if (row >= r0 && row <= r1) continue;
    fillOutside(row * w + g0, row * w + g1 + 1, ...outs);
  }
  for (let row = r0; row <= r1; row++) {
    if (row >= f0 && row <= f1) {
      fillOutside(row * w + g0, row * w + Math.min(g1 + 1, c0), ...outs);
      fillOutside(row * w + Math.max(g0, c1 + 1), row * w + g1 + 1, ...outs);
    }
    if (rotating) stageRowRotating(ctx, row);
    else stageRow(ctx, row);
  }
  out.extent = { rowMin: r0, rowMax: r1, colMin: c0, colMax: c1 };
  for (const h of out.heights)
    for (const t of h.targets) if (t.pd !== null) t.pdExtent = positiveBounds(t.pd, w, out.extent);
  return out;
}

/** The bounding rectangle of the cells of `within` where `a` > 0 (empty: rowMin > rowMax). */
export function positiveBounds(a: Float32Array, width: number, within: RadarExtent): RadarExtent {
  let rowMin = within.rowMax + 1;
  let rowMax = within.rowMin - 1;
  let colMin = within.colMax + 1;
  let colMax = within.colMin - 1;
  for (let row = within.rowMin; row <= within.rowMax; row++) {
    const base = row * width;
    let first = -1;
    let last = -1;
    for (let c = within.colMin; c <= within.colMax; c++)
      if (a[base + c] > 0) {
        first = c;
        break;
      }
    if (first < 0) continue;
    for (let c = within.colMax; c >= first; c--)
      if (a[base + c] > 0) {
        last = c;
        break;
      }
    if (row < rowMin) rowMin = row;
    rowMax = row;
    if (first < colMin) colMin = first;
    if (last > colMax) colMax = last;
  }
  return rowMin > rowMax
    ? { rowMin: 0, rowMax: -1, colMin: 0, colMax: -1 }
    : { rowMin, rowMax, colMin, colMax };
}
