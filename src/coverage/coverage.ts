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
 * the Float32 bit pattern with a 1024-entry mantissa table, Pd from the pdTable lookup. Table errors
 * are stated beside each table and checked against the exact scalar path (coveragePoint) in tests.
 * Rules CV1–CV9 in docs/model-spec.md ("Coverage").
 */
import { makeRelativeGain, receiveAntenna, relativeGainDb, scanGeometry } from "./antennaPattern.ts";
import { twoWayGasLossDb } from "./atmosphere.ts";
import { pdExact, type SwerlingCase } from "./detection.ts";
import type { GridFrame } from "./grid.ts";
import { buildPdTable, type PdTable, pdFromSnr } from "./pdTable.ts";
import { knifeEdgeLossDb } from "./propagation.ts";
import { type RadarEquationParams, radarEquationParams, snrAtRange, snrConstant } from "./radarEquation.ts";
import type { AntennaSpec, RadarModel, ScanMode } from "./radarModel.ts";
import { curvatureFactorPerM, type HorizonResult } from "./terrainMask.ts";
import { dbsmToM2, dbToLinear, linearToDb, radToDeg, wrapDeg360 } from "./units.ts";
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
// Per-radar tables

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
/** Bit pattern of +Infinity (IEEE Std 754-2019 §3.4); above it (unsigned) lie NaNs and negatives. */
const F32_POSITIVE_INFINITY_BITS = 0x7f800000;
const DB_PER_LOG2 = linearToDb(2);

const LOG2_MANTISSA = (() => {
  const n = 1 << LOG_MANTISSA_BITS;
  const t = new Float32Array(n);
  // Centre of each bin of 1 + m/n.
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
  /** F⁴ (two way) over v. */
  knifeEdgeF4: Float32Array;
  /** Two-way gas-loss factor over R in [0, maxRangeM]. */
  gasFactor: Float32Array;
  /** Two-way gas loss per metre of slant range, dB/m. */
  gasLossDbPerM: number;
  /** Pd tables per target class, and the RCS in m². */
  pdTables: PdTable[];
  rcsM2: number[];
  requiredPd: number;
}

const pdTableCache = new Map<string, PdTable>();

/** The Pd table for one detection setting, built once per process (tens of ms each) and reused. */
export function cachedPdTable(pfa: number, looks: number, swerling: SwerlingCase): PdTable {
  const key = `${pfa}|${looks}|${swerling}`;
  let t = pdTableCache.get(key);
  if (t === undefined) {
    t = buildPdTable({ pfa, looks, swerling });
    pdTableCache.set(key, t);
  }
  return t;
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
  for (let b = 0; b < vBins; b++) knifeEdgeF4[b] = dbToLinear(-2 * knifeEdgeLossDb(V_MIN + b * V_STEP));

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
    gasFactor,
    gasLossDbPerM,
    pdTables: targets.map((t) => cachedPdTable(requirement.pfa, requirement.looks, t.swerling)),
    rcsM2: targets.map((t) => dbsmToM2(t.rcsDbsm)),
    requiredPd: requirement.requiredPd,
  };
}

/**
 * Allocate the outputs of one radar, zeroed. The radar stage writes every cell: inside the square it
 * visits cell by cell, outside it with fills (reason out of range, SNR and lowest height NaN).
 */
function allocateCoverage(input: RadarStageInput, reuse?: RadarCoverage): RadarCoverage {
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
function fitsShape(r: RadarCoverage, input: RadarStageInput, n: number): boolean {
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
 * the outputs (radarCoverageFromHorizon builds it once per call; stageRow reads it once per row).
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
  mantShift: number;
  mantMask: number;
  requiredPd: number;
  rcs0: number;
  lo0: number;
  hi0: number;
  shift0: number;
  fracMask0: number;
  fracScale0: number;
  pfa0: number;
  lowSlope0: number;
  pdHigh0: number;
  ground: Float32Array;
  hs: Float32Array;
  od: Float32Array;
  obstructionTopAglM: Float32Array;
  lowest: Float32Array;
  snrOut: Float32Array[];
  pdOut: Float32Array[];
  reasonOut: Uint8Array[];
  heights: Float64Array;
  rotating: boolean;
  azTx: Float32Array;
  azRx: Float32Array;
  azInSector: Uint8Array;
  elTx: Float32Array;
  elRx: Float32Array;
  knifeEdgeF4: Float32Array;
  gasFactor: Float32Array;
  f32: Float32Array;
  u32: Uint32Array;
  rcs: Float64Array;
  tBitsLow: Int32Array;
  tBitsHigh: Int32Array;
  tShift: Int32Array;
  tFracMask: Int32Array;
  tFracScale: Float64Array;
  tPfa: Float64Array;
  tLowSlope: Float64Array;
  tPdHigh: Float64Array;
  tValues: Float32Array[];
  vals0: Float32Array;
  /** Rotating radar: C·g_t·g_r per elevation bin, −1 outside the elevation field (else empty). */
  cGain: Float64Array;
}

/**
 * One row of the radar stage (cells c0..c1). A function of its own so that V8 optimises it as a whole
 * and keeps that code from call to call (a loop inside the caller is compiled on stack replacement,
 * dropped when the code after the loop deoptimises, and recompiled on every call).
 */
function stageRow(s: StageRowContext, row: number): void {
  const {
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
    twoOverLambda,
    minR2,
    maxR2,
    elScale,
    floorTx,
    floorRx,
    vScale,
    vLast,
    C,
    gasScale,
    mantShift,
    mantMask,
    requiredPd,
    rcs0,
    lo0,
    hi0,
    shift0,
    fracMask0,
    fracScale0,
    pfa0,
    lowSlope0,
    pdHigh0,
    ground,
    hs,
    od,
    obstructionTopAglM,
    lowest,
    snrOut,
    pdOut,
    reasonOut,
    heights,
    rotating,
    azTx,
    azRx,
    azInSector,
    elTx,
    elRx,
    knifeEdgeF4,
    gasFactor,
    f32,
    u32,
    rcs,
    tBitsLow,
    tBitsHigh,
    tShift,
    tFracMask,
    tFracScale,
    tPfa,
    tLowSlope,
    tPdHigh,
    tValues,
    vals0,
    cGain,
  } = s;
  const log2Mantissa = LOG2_MANTISSA;
  const dbPerLog2 = DB_PER_LOG2;
  const vMin = V_MIN;
  const expBias = F32_EXPONENT_BIAS;
  const expShift = F32_MANTISSA_BITS;
  const infBits = F32_POSITIVE_INFINITY_BITS;
  const rCovered = Reason.covered;
  const rMasked = Reason.masked;
  const rOutOfRange = Reason.outOfRange;
  const rBlindZone = Reason.blindZone;
  const rOutOfSector = Reason.outOfSector;
  const rTooWeak = Reason.tooWeak;
  const rInside = Reason.insideObstruction;
  const rNodata = Reason.nodata;
  const northM = (orow - row) * cellM;
  const dy2 = (row - orow) * (row - orow);
  for (let col = c0; col <= c1; col++) {
    const i = row * w + col;
    // Horizontal distance between cell centres, as terrainMask.ts defines it (rule TM1), computed
    // here rather than read from horizon.distanceM (filled lazily there; this saves that pass).
    const dxc = col - oc;
    const d = cellM * Math.sqrt(dxc * dxc + dy2);
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
    let aTx = 1;
    let aRx = 1;
    let inSectorAz = 1;
    if (!rotating) {
      const j = pseudoAngleBin((col - oc) * cellM, northM);
      aTx = azTx[j];
      aRx = azRx[j];
      inSectorAz = azInSector[j];
    }
    const d2 = d * d;
    const base = g - H - d2 * curv;
    // Lowest visible height (terrainMask.ts rule TM5): −base + σ·d, at least 0; 0 where nothing obstructs.
    lowest[i] = sigma === Number.NEGATIVE_INFINITY ? 0 : Math.max(0, sigma * d - base);
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
    if (sigma !== Number.NEGATIVE_INFINITY) {
      const s = od[i];
      const rest = d - s > 0 ? d - s : cellM * 0.5;
      const kv = Math.sqrt(twoOverLambda * (1 / s + 1 / rest));
      va = kv * s * sigma;
      vb = (kv * s) / d;
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
      if (code >= 0) {
        snrOut[k][i] = Number.NaN;
        for (let t = 0; t < nt; t++) {
          pdOut[q0 + t][i] = 0;
          reasonOut[q0 + t][i] = code;
        }
        continue;
      }
      const invR = 1 / Math.sqrt(R2);
      const m = (dh * invR * elScale + elScale + 0.5) | 0;
      // C·g_t·g_r (−1 outside the elevation field): from the per-call table for a rotating radar,
      // whose azimuth factors are 1 (same products in the same order, so the same value).
      let cg = rotating ? cGain[m] : -1;
      if (!rotating) {
        const eTx = elTx[m];
        if (eTx >= 0) {
          let gt = aTx * eTx;
          if (gt < floorTx) gt = floorTx;
          let gr = aRx * elRx[m];
          if (gr < floorRx) gr = floorRx;
          cg = C * gt * gr;
        }
      }
      if (cg < 0) {
        snrOut[k][i] = Number.NaN;
        for (let t = 0; t < nt; t++) {
          pdOut[q0 + t][i] = 0;
          reasonOut[q0 + t][i] = rOutOfSector;
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
      snrOut[k][i] =
        snr > 0
          ? dbPerLog2 * ((bits >>> expShift) - expBias + log2Mantissa[(bits >>> mantShift) & mantMask])
          : Number.NEGATIVE_INFINITY;
      const weakCode = inSectorAz === 0 ? rOutOfSector : v > 0 ? rMasked : rTooWeak;
      if (nt === 1) {
        // One class (the common case): its table fields in locals, no per-class array loads.
        f32[0] = snr * rcs0;
        const u = u32[0];
        let pd: number;
        if (u >= lo0 && u < hi0) {
          const du = u - lo0;
          const jj = du >>> shift0;
          const a = vals0[jj];
          pd = a + (du & fracMask0) * fracScale0 * (vals0[jj + 1] - a);
        } else if (u < lo0) {
          const f = f32[0];
          pd = f > 0 ? pfa0 + f * lowSlope0 : 0;
        } else pd = u <= infBits ? pdHigh0 : 0;
        pdOut[q0][i] = pd;
        reasonOut[q0][i] = pd >= requiredPd ? rCovered : weakCode;
        continue;
      }
      for (let t = 0; t < nt; t++) {
        // Inline pdTable lookup (pdTable.ts pdFromSnr): Float32 bits → bin and fraction.
        f32[0] = snr * rcs[t];
        const u = u32[0];
        let pd: number;
        const lo = tBitsLow[t];
        if (u >= lo && u < tBitsHigh[t]) {
          const du = u - lo;
          const jj = du >>> tShift[t];
          const vals = tValues[t];
          const a = vals[jj];
          pd = a + (du & tFracMask[t]) * tFracScale[t] * (vals[jj + 1] - a);
        } else if (u < lo) {
          const f = f32[0];
          pd = f > 0 ? tPfa[t] + f * tLowSlope[t] : 0;
        } else pd = u <= infBits ? tPdHigh[t] : 0;
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
  let scratchPd: Float32Array | null = null;
  let scratchReason: Uint8Array | null = null;
  for (const hc of out.heights)
    for (const tc of hc.targets) {
      if (tc.pd === null || tc.reason === null) {
        scratchPd ??= new Float32Array(n);
        scratchReason ??= new Uint8Array(n);
        pdOut.push(scratchPd);
        reasonOut.push(scratchReason);
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
  const rcs = Float64Array.from(kernel.rcsM2);
  // Pd tables unpacked per class (pdTable.ts layout).
  const tBitsLow = Int32Array.from(kernel.pdTables, (t) => t.bitsLow);
  const tBitsHigh = Int32Array.from(kernel.pdTables, (t) => t.bitsHigh);
  const tShift = Int32Array.from(kernel.pdTables, (t) => t.shift);
  const tFracMask = Int32Array.from(kernel.pdTables, (t) => t.fracMask);
  const tFracScale = Float64Array.from(kernel.pdTables, (t) => t.fracScale);
  const tPfa = Float64Array.from(kernel.pdTables, (t) => t.pfa);
  const tLowSlope = Float64Array.from(kernel.pdTables, (t) => t.lowSlope);
  const tPdHigh = Float64Array.from(kernel.pdTables, (t) => t.pdHigh);
  const tValues = kernel.pdTables.map((t) => t.values);
  const minR2 = kernel.minRangeM * kernel.minRangeM;
  const maxR = kernel.maxRangeM;
  const maxR2 = maxR * maxR;
  const rotating = azTx.length === 1;
  const elScale = (EL_BINS - 1) / 2;
  const vScale = 1 / V_STEP;
  const vLast = knifeEdgeF4.length - 1;
  const gasScale = GAS_BINS / maxR;
  const twoOverLambda = 2 / kernel.wavelengthM;
  const hs = horizon.horizonSlope;
  const od = horizon.obstacleDistanceM;
  const f32 = new Float32Array(1);
  const u32 = new Uint32Array(f32.buffer);
  const mantShift = F32_MANTISSA_BITS - LOG_MANTISSA_BITS;
  const mantMask = (1 << LOG_MANTISSA_BITS) - 1;
  // The first class's table fields (the only one in most plans), for the one-class path of the loop.
  const rcs0 = nt > 0 ? rcs[0] : 0;
  const lo0 = nt > 0 ? tBitsLow[0] : 0;
  const hi0 = nt > 0 ? tBitsHigh[0] : 0;
  const shift0 = nt > 0 ? tShift[0] : 0;
  const fracMask0 = nt > 0 ? tFracMask[0] : 0;
  const fracScale0 = nt > 0 ? tFracScale[0] : 0;
  const pfa0 = nt > 0 ? tPfa[0] : 0;
  const lowSlope0 = nt > 0 ? tLowSlope[0] : 0;
  const pdHigh0 = nt > 0 ? tPdHigh[0] : 0;
  const vals0 = nt > 0 ? tValues[0] : new Float32Array(2);

  const spanCells = Number.isFinite(maxR) ? Math.ceil(maxR / cellM) + 1 : Math.max(w, hgt);
  const r0 = Math.max(0, orow - spanCells);
  const r1 = Math.min(hgt - 1, orow + spanCells);
  const c0 = Math.max(0, oc - spanCells);
  const c1 = Math.min(w - 1, oc + spanCells);

  // Outside the square every output is "out of range". A reused result whose own square lay inside
  // this one already holds exactly that outside this square (its stage filled it), so only this
  // square is written then; otherwise the outside is filled here.
  const old = reuse !== undefined && out === reuse ? reuse.extent : undefined;
  const outsideFilled =
    old !== undefined && old.rowMin >= r0 && old.rowMax <= r1 && old.colMin >= c0 && old.colMax <= c1;
  out.extent = undefined; // while being written, the arrays match no extent
  // Rotating: the azimuth factors are 1, so C·g_t·g_r depends on the elevation bin alone.
  const cGain = new Float64Array(rotating ? elTx.length : 0);
  for (let m = 0; m < cGain.length; m++) {
    const eTx = elTx[m];
    if (eTx < 0) {
      cGain[m] = -1;
      continue;
    }
    let gt = eTx;
    if (gt < floorTx) gt = floorTx;
    let gr = elRx[m];
    if (gr < floorRx) gr = floorRx;
    cGain[m] = C * gt * gr;
  }
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
    twoOverLambda,
    minR2,
    maxR2,
    elScale,
    floorTx,
    floorRx,
    vScale,
    vLast,
    C,
    gasScale,
    mantShift,
    mantMask,
    requiredPd,
    rcs0,
    lo0,
    hi0,
    shift0,
    fracMask0,
    fracScale0,
    pfa0,
    lowSlope0,
    pdHigh0,
    ground,
    hs,
    od,
    obstructionTopAglM,
    lowest,
    snrOut,
    pdOut,
    reasonOut,
    heights,
    rotating,
    azTx,
    azRx,
    azInSector,
    elTx,
    elRx,
    knifeEdgeF4,
    gasFactor,
    f32,
    u32,
    rcs,
    tBitsLow,
    tBitsHigh,
    tShift,
    tFracMask,
    tFracScale,
    tPfa,
    tLowSlope,
    tPdHigh,
    tValues,
    vals0,
    cGain,
  };
  if (!outsideFilled) {
    fillOutside(0, r0 * w, lowest, snrOut, pdOut, reasonOut);
    fillOutside((r1 + 1) * w, n, lowest, snrOut, pdOut, reasonOut);
  }
  for (let row = r0; row <= r1; row++) {
    if (!outsideFilled) {
      fillOutside(row * w, row * w + c0, lowest, snrOut, pdOut, reasonOut);
      fillOutside(row * w + c1 + 1, (row + 1) * w, lowest, snrOut, pdOut, reasonOut);
    }
    stageRow(ctx, row);
  }
  out.extent = { rowMin: r0, rowMax: r1, colMin: c0, colMax: c1 };
  return out;
}

// ---------------------------------------------------------------------------------------------
// The exact scalar path (one point): for evaluatePoint and as the yardstick of the tables.

/** Geometry of one target position seen from a radar. */
export interface PointGeometry {
  /** Horizontal distance, m. */
  distanceM: number;
  /** Target height above the antenna after Earth curvature, m. */
  heightAboveAntennaM: number;
  /** Slant range, m. */
  slantRangeM: number;
  /** Bearing from the radar, degrees clockwise from north. */
  azimuthDeg: number;
  /** Elevation seen from the antenna, degrees (curvature included). */
  elevationDeg: number;
}

/** Exact (no table) coverage of one radar at one target position and class. */
export interface PointCoverage {
  geometry: PointGeometry;
  /** Radar-equation parameters towards the target (gains, gas loss, F⁴), for the link budget. */
  params: RadarEquationParams;
  /** One-way gains towards the target, dBi (−Infinity where not instrumented). */
  txGainDbi: number;
  rxGainDbi: number;
  /** Height of the dominant obstruction above the sight line, m (−Infinity: nothing obstructs). */
  obstructionClearanceM: number;
  /** Fresnel–Kirchhoff v of that obstruction (−Infinity when none). */
  fresnelV: number;
  /** One-way knife-edge loss J(v), dB (ITU-R P.526-15 eq. 31). */
  diffractionLossOneWayDb: number;
  /** Two-way gas loss, dB. */
  gasLossDb: number;
  /** SNR for the class's RCS, dB. */
  snrDb: number;
  /** Exact Pd (detection.ts pdExact) and the table Pd. */
  pdExact: number;
  pdTable: number;
  visible: boolean;
  reason: Reason;
}

/**
 * Exact coverage of one radar at one cell and height for one class: same physics as the hot loop with
 * trigonometry, J(v) and pdExact evaluated directly (the yardstick of the tables, rule CV2).
 * @param cell the cell's horizon slope (m/m, −Infinity none, NaN nodata), obstacle distance (m),
 *   horizontal distance (m), east/north offsets from the radar (m), ground (m ASL), obstruction top (m AGL)
 *   and the cell size (m; the shortest edge-to-target distance). Out-of-field cells get Pd 0.
 */
export function coveragePoint(
  input: {
    radar: PlacedRadar;
    target: TargetSpec;
    requirement: DetectionRequirement;
    effectiveEarthFactor: number;
    heightAglM: number;
  },
  cell: {
    horizonSlope: number;
    obstacleDistanceM: number;
    distanceM: number;
    eastM: number;
    northM: number;
    groundM: number;
    obstructionTopAglM: number;
    cellSizeM: number;
  },
): PointCoverage {
  const { radar, target, requirement, heightAglM } = input;
  const model = radar.model;
  const curv = curvatureFactorPerM(input.effectiveEarthFactor);
  const d = cell.distanceM;
  const dh = cell.groundM + heightAglM - radar.antennaHeightAslM - d * d * curv;
  const R = Math.hypot(d, dh);
  const azimuthDeg = d > 0 ? wrapDeg360(radToDeg(Math.atan2(cell.eastM, cell.northM))) : radar.boresightAzDeg;
  const elevationDeg = radToDeg(Math.atan2(dh, d));
  const geometry: PointGeometry = {
    distanceM: d,
    heightAboveAntennaM: dh,
    slantRangeM: R,
    azimuthDeg,
    elevationDeg,
  };
  const pointing = { scan: radar.scan, boresightAzDeg: radar.boresightAzDeg, tiltDeg: radar.tiltDeg };
  const gTx = makeRelativeGain({ ...pointing, antenna: model.txAntenna })(azimuthDeg, elevationDeg);
  const gRx = makeRelativeGain({ ...pointing, antenna: receiveAntenna(model) })(azimuthDeg, elevationDeg);
  const txGainDbi = model.txAntenna.peakGainDbi + linearToDb(gTx);
  const rxGainDbi = receiveAntenna(model).peakGainDbi + linearToDb(gRx);
  const geo = scanGeometry(pointing, azimuthDeg, elevationDeg);
  let clearance = Number.NEGATIVE_INFINITY;
  let v = Number.NEGATIVE_INFINITY;
  if (cell.horizonSlope !== Number.NEGATIVE_INFINITY && Number.isFinite(cell.horizonSlope)) {
    const s = cell.obstacleDistanceM;
    clearance = s * (cell.horizonSlope - dh / d);
    const rest = d - s > 0 ? d - s : 0.5 * cell.cellSizeM;
    v = clearance * Math.sqrt((2 / wavelengthM(model.frequencyHz)) * (1 / s + 1 / rest));
  }
  const jDb = v === Number.NEGATIVE_INFINITY ? 0 : knifeEdgeLossDb(v);
  const { minM, maxM } = radarRangeWindowM(model);
  const gasLossRaw = twoWayGasLossDb({ frequencyHz: model.frequencyHz, rangeM: R });
  // Below 1 GHz P.676 is not evaluated (NaN) and the loss is negligible: 0, as in buildRadarKernel.
  const gasLossDb = Number.isFinite(gasLossRaw) ? gasLossRaw : 0;
  const params = radarEquationParams(model, {
    rcsM2: dbsmToM2(target.rcsDbsm),
    txGainDbi,
    rxGainDbi,
    atmosphericLossDb: gasLossDb,
    propagationFactorDb: -2 * jDb,
  });
  const snrLinear = snrAtRange(params, R);
  const snrDb = linearToDb(snrLinear);
  const visible = !(clearance > 0);
  let reason: Reason;
  if (Number.isNaN(cell.groundM) || Number.isNaN(cell.horizonSlope)) reason = Reason.nodata;
  else if (cell.obstructionTopAglM > heightAglM) reason = Reason.insideObstruction;
  else if (R < minM || R === 0) reason = Reason.blindZone;
  else if (R > maxM) reason = Reason.outOfRange;
  else if (!geo.instrumented) reason = Reason.outOfSector;
  else reason = Reason.tooWeak;
  let pdE = 0;
  let pdT = 0;
  if (reason === Reason.tooWeak) {
    pdE = pdExact({ snrLinear, pfa: requirement.pfa, looks: requirement.looks, swerling: target.swerling });
    pdT = pdFromSnr(cachedPdTable(requirement.pfa, requirement.looks, target.swerling), snrLinear);
    if (pdT >= requirement.requiredPd) reason = Reason.covered;
    else if (!geo.inSector) reason = Reason.outOfSector;
    else if (!visible) reason = Reason.masked;
  }
  return {
    geometry,
    params,
    txGainDbi,
    rxGainDbi,
    obstructionClearanceM: clearance,
    fresnelV: v,
    diffractionLossOneWayDb: jDb,
    gasLossDb,
    snrDb,
    pdExact: pdE,
    pdTable: pdT,
    visible,
    reason,
  };
}
