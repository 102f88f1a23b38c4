/**
 * Accurate masking sweep (R2 class, Franklin & Ray 1994): straight rays from the observer's cell centre
 * to every cell of the perimeter, split into four triangles (east, west: |dy| ≤ |dx|; north, south:
 * |dx| < |dy|). A ray samples the surface wherever it crosses a grid line between cell centres — the
 * major lines and the minor lines, as the exact ray march R3 does — by linear interpolation between the
 * two centres it passes between, and keeps its running horizon. A cell takes the horizon of the two rays
 * that bracket its centre, interpolated linearly, as it was before the rays reached the cell's own line
 * (the cell never masks itself). Rules TM1–TM7 in docs/model-spec.md.
 *
 * Memory order: all rays advance together, a band of BAND major lines at a time. Inside a band each ray
 * runs through the band's lines with its state in registers and leaves its horizon and obstacle distance
 * before every line in a small ray-major buffer; the band's cells are then written in the grid's own row
 * order. Every pass reads and writes memory in order whichever way the triangle points, with no
 * transposed copies.
 */

import type { SweepSetup } from "./terrainMask.ts";

/**
 * Rays per cell of the triangle's far edge. 1 puts one ray through every perimeter cell centre (R2); with
 * minor-line samples this keeps the lowest-visible-height error well inside the TM7 bounds.
 */
const RAYS_PER_PERIMETER_CELL = 1;

/** Crossing fractions at or above this are the next line's node (rounding margin of 1e-9 of a line). */
const NODE_FRACTION_LIMIT = 1 - 1e-9;

/** Major lines per band (the ray state stays in registers across a band). */
const BAND = 32;

/** One triangle of the sweep: which axis advances (major) and how indices move. */
interface Triangle {
  /** Grid index step for one major step outward (±1 or ±width). */
  majorStride: number;
  /** Grid index step for one minor step (+width or +1). */
  minorStride: number;
  /** Major steps available from the observer to the grid edge. */
  majorSteps: number;
  /** Observer position on the minor axis. */
  minorObs: number;
  /** Cells on the minor axis. */
  minorLen: number;
  /** East/west: true (the diagonals |minor| = major belong to them, cells written minor-outer). */
  eastWest: boolean;
}

/** Working arrays reused by the four triangles (no allocation in the hot loops). */
interface RayBuffers {
  horizon: Float64Array;
  obstacleM: Float64Array;
  /** Horizon (m/m) and obstacle distance (m) of ray j before band line b, at 2·(j·BAND + b) and the next. */
  band: Float32Array;
  raysPerMinor: Float64Array;
  invLine: Float64Array;
  /** Per ray of the triangle: step length L (m), 1/L, 1/t, L²/(2ka) per line², footprint in lines. */
  lenM: Float64Array;
  invLenM: Float64Array;
  invRayStep: Float64Array;
  curvPerLine2: Float64Array;
  exclLines: Float64Array;
  /** First major line the ray does not sample: off the grid or beyond what the range needs (≤ steps + 1). */
  exitLine: Float64Array;
  /** Band line numbers as doubles (no integer conversion in the ray loop). */
  lineM: Float64Array;
}

function buffers(maxRays: number): RayBuffers {
  return {
    horizon: new Float64Array(maxRays),
    obstacleM: new Float64Array(maxRays),
    band: new Float32Array(2 * maxRays * BAND),
    raysPerMinor: new Float64Array(BAND),
    invLine: new Float64Array(BAND),
    lenM: new Float64Array(maxRays),
    invLenM: new Float64Array(maxRays),
    invRayStep: new Float64Array(maxRays),
    curvPerLine2: new Float64Array(maxRays),
    exclLines: new Float64Array(maxRays),
    exitLine: new Float64Array(maxRays),
    lineM: new Float64Array(BAND),
  };
}

/**
 * Fills horizon slope (m/m) and obstacle distance (m) for every cell within range, accurate mode.
 * Cells in range are written (NaN for nodata); cells beyond the range are not.
 */
export function computeHorizonAccurate(
  s: SweepSetup,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
): void {
  const w = s.width;
  const h = s.height;
  const oc = s.observerCol;
  const or = s.observerRow;
  const obsIdx = or * w + oc;
  outSlope[obsIdx] = Number.isNaN(s.z[obsIdx]) ? Number.NaN : Number.NEGATIVE_INFINITY;
  outObstacleM[obsIdx] = Number.NaN;
  const rangeSteps = Math.floor(s.maxRangeM / s.cellSizeM);
  const triangles: Triangle[] = [
    { majorStride: 1, minorStride: w, majorSteps: w - 1 - oc, minorObs: or, minorLen: h, eastWest: true },
    { majorStride: -1, minorStride: w, majorSteps: oc, minorObs: or, minorLen: h, eastWest: true },
    { majorStride: -w, minorStride: 1, majorSteps: or, minorObs: oc, minorLen: w, eastWest: false },
    { majorStride: w, minorStride: 1, majorSteps: h - 1 - or, minorObs: oc, minorLen: w, eastWest: false },
  ];
  let maxRays = 0;
  for (const t of triangles)
    maxRays = Math.max(
      maxRays,
      2 * Math.ceil(Math.min(t.majorSteps, rangeSteps) * RAYS_PER_PERIMETER_CELL) + 1,
    );
  const buf = buffers(maxRays);
  for (const t of triangles) {
    const steps = Math.min(t.majorSteps, rangeSteps);
    if (steps < 1) continue;
    prepareRays(s, t, steps, buf);
    for (let m0 = 1; m0 <= steps; m0 += BAND) {
      const nb = Math.min(BAND, steps - m0 + 1);
      advanceRays(s, t, steps, m0, nb, obsIdx, buf);
      writeCells(s, t, steps, m0, nb, obsIdx, buf, outSlope, outObstacleM);
    }
  }
}

/** Starts every ray of a triangle unobstructed and tabulates its constants. */
function prepareRays(s: SweepSetup, t: Triangle, steps: number, buf: RayBuffers): void {
  const span = Math.ceil(steps * RAYS_PER_PERIMETER_CELL);
  const invSpan = 1 / span;
  const minorLast = t.minorLen - 1;
  const minorObs = t.minorObs;
  const rangeLines = s.maxRangeM / s.cellSizeM;
  for (let j = 0; j < 2 * span + 1; j++) {
    const rayStep = (j - span) * invSpan;
    const lenM = s.cellSizeM * Math.sqrt(1 + rayStep * rayStep);
    buf.horizon[j] = Number.NEGATIVE_INFINITY;
    buf.obstacleM[j] = Number.NaN;
    buf.lenM[j] = lenM;
    buf.invLenM[j] = 1 / lenM;
    buf.invRayStep[j] = 1 / rayStep;
    buf.curvPerLine2[j] = lenM * lenM * s.curvaturePerM;
    buf.exclLines[j] = s.ownFootprintRadiusM / lenM;
    // Lines on which the ray is inside the grid (y is monotonic in m and starts inside): m < exit, found
    // with the ray loop's own expression so that the test agrees with it exactly.
    let exit = steps + 1;
    if (rayStep !== 0) {
      const room = rayStep > 0 ? minorLast - minorObs : minorObs;
      exit = Math.min(steps + 1, Math.floor(room / Math.abs(rayStep)) + 1);
      while (exit > 1 && !inside(minorObs + rayStep * (exit - 1), minorLast)) exit--;
      while (exit <= steps && inside(minorObs + rayStep * exit, minorLast)) exit++;
    }
    // Within a range limit a ray serves only the cells that take it (|q| ≥ (|j − span| − 1)·m/span on line
    // m, writeCells) and lie in range (m² + q² ≤ range²): its records hold from the exit line on, so it
    // stops one line after the last such line, plus one for rounding (the cells beyond are never written).
    const lean = Math.max(0, Math.abs(j - span) - 1) * invSpan;
    const rangeExit = Math.floor(rangeLines / Math.sqrt(1 + lean * lean)) + 2;
    buf.exitLine[j] = Math.min(exit, rangeExit);
  }
}

/**
 * Runs every ray through band lines m0..m0+nb−1, recording its horizon before each line.
 * Inside the loop a ray keeps its horizon scaled by its step length L (σ·L = rel/m − m·L²/(2ka) at major
 * line m), so a major sample costs no division; a minor crossing is first tested in height
 * (rel > m′·(σL + m′·L²/(2ka))) and divides only when it raises the horizon.
 */
function advanceRays(
  s: SweepSetup,
  t: Triangle,
  steps: number,
  m0: number,
  nb: number,
  obsIdx: number,
  buf: RayBuffers,
): void {
  const z = s.z;
  const antenna = s.antennaHeightAslM;
  const { majorStride, minorStride, minorObs } = t;
  const minorLast = t.minorLen - 1;
  // A grid one cell wide on the minor axis interpolates between a cell and itself.
  const minorLast1 = minorLast > 0 ? minorLast - 1 : 0;
  const nextMinor = minorLast > 0 ? minorStride : 0;
  const span = Math.ceil(steps * RAYS_PER_PERIMETER_CELL);
  const nRays = 2 * span + 1;
  const invSpan = 1 / span;
  const hz = buf.horizon;
  const od = buf.obstacleM;
  const rec = buf.band;
  const base = obsIdx - minorObs * minorStride;
  const invLine = buf.invLine;
  const lineM = buf.lineM;
  // Locals: TurboFan folds them, where module constants are reloaded on every access.
  const nodeLimit = NODE_FRACTION_LIMIT;
  const band = BAND;
  for (let b = 0; b < nb; b++) {
    lineM[b] = m0 + b;
    invLine[b] = 1 / (m0 + b);
  }
  const mEnd = m0 + nb;
  const mStop = Math.min(mEnd, steps);
  const lenTab = buf.lenM;
  const invLenTab = buf.invLenM;
  const invRayStepTab = buf.invRayStep;
  const curvTab = buf.curvPerLine2;
  const exclTab = buf.exclLines;
  const exitTab = buf.exitLine;
  for (let j = 0; j < nRays; j++) {
    const rayStep = (j - span) * invSpan;
    const lenM = lenTab[j];
    const invLenM = invLenTab[j];
    const invRayStep = invRayStepTab[j];
    // Curvature term per line, and the footprint in lines, of this ray.
    const c2 = curvTab[j];
    const mExcl = exclTab[j];
    let best = hz[j] * lenM;
    let bestM = od[j];
    const exit = exitTab[j];
    const mIn = exit < mStop ? Math.max(exit, m0) : mStop;
    // Ray j's record before band line b is at 2·(j·BAND + b) (horizon) and the next index (obstacle).
    let k = 2 * j * band;
    let lineBase = base + m0 * majorStride;
    // Minor index crossed after the line: floor(y) + 1 going up, floor(y) going down.
    const up = rayStep > 0 ? 1 : 0;
    // The triangle's last line is written but never sampled (nothing lies beyond it).
    let mD = lineM[0] - 1;
    // Integer index arithmetic as `| 0` (int32, no overflow checks: every index fits the grid).
    for (let bi = 0, m = m0; m < mIn; m++, bi++, k = (k + 2) | 0, lineBase = (lineBase + majorStride) | 0) {
      rec[k] = best * invLenM;
      rec[(k + 1) | 0] = bestM;
      mD += 1;
      const y = minorObs + rayStep * mD;
      // Sample where the ray crosses major line m (y ≥ 0, so truncation is the floor).
      const k0 = y | 0;
      const r0 = k0 < minorLast ? k0 : minorLast1;
      const f = y - r0;
      const i0 = (lineBase + Math.imul(r0, minorStride)) | 0;
      const za = z[i0];
      // Tested in height, as the minor crossings below: rel > m·(σL + m·L²/(2ka)); divides only on a rise.
      const rel = za + (z[(i0 + nextMinor) | 0] - za) * f - antenna;
      if (rel > mD * (best + mD * c2) && mD > mExcl) {
        const sl = rel * invLine[bi] - mD * c2;
        if (sl > best) {
          best = sl;
          bestM = mD * lenM;
        }
      }
      // Sample where it crosses the next minor line kk before major line m+1 (m < steps ≤ majorSteps: it
      // exists), at the fraction g of the step: g ≥ 1 means no crossing (NaN on the axis ray). g = 1 is the
      // node on line m+1 itself (a cell centre, sampled there): only 0 ≤ g < 1 here, with a margin for the
      // rounding of y at exact nodes.
      const kk = (k0 + up) | 0;
      const g = (kk - y) * invRayStep;
      if (g < nodeLimit && kk <= minorLast && kk >= 0) {
        const ik = (lineBase + Math.imul(kk, minorStride)) | 0;
        const zp = z[ik];
        const relK = zp + (z[(ik + majorStride) | 0] - zp) * g - antenna;
        const mk = mD + g;
        if (relK > mk * (best + mk * c2) && mk > mExcl) {
          const sk = relK / mk - mk * c2;
          if (sk > best) {
            best = sk;
            bestM = mk * lenM;
          }
        }
      }
    }
    // Beyond the grid edge the ray samples nothing: its horizon stays.
    for (let m = mIn; m < mEnd; m++, k += 2) {
      rec[k] = best * invLenM;
      rec[k + 1] = bestM;
    }
    hz[j] = best * invLenM;
    od[j] = bestM;
  }
}

/** Whether a ray's minor coordinate lies on the grid (0 ≤ y ≤ last). */
function inside(y: number, minorLast: number): boolean {
  return y >= 0 && y <= minorLast;
}

/**
 * Writes the cells of band lines m0..m0+nb−1 from the two rays bracketing each cell centre. A nodata cell
 * gets NaN through `z − z` (0 elsewhere) added to both outputs, with no branch.
 */
function writeCells(
  s: SweepSetup,
  t: Triangle,
  steps: number,
  m0: number,
  nb: number,
  obsIdx: number,
  buf: RayBuffers,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
): void {
  const z = s.z;
  const cell = s.cellSizeM;
  const maxRange2 = (s.maxRangeM / cell) * (s.maxRangeM / cell);
  const { majorStride, minorStride, minorObs } = t;
  const minorLast = t.minorLen - 1;
  const span = Math.ceil(steps * RAYS_PER_PERIMETER_CELL);
  const jMax = 2 * span - 1;
  const rec = buf.band;
  const rpm = buf.raysPerMinor;
  for (let b = 0; b < nb; b++) rpm[b] = span / (m0 + b);
  const base = obsIdx - minorObs * minorStride;
  // Locals: TurboFan folds them, where module constants are reloaded on every access.
  const NEG = -Infinity;
  // Record stride of one ray in the band buffer.
  const band2 = 2 * BAND;
  const mTop = m0 + nb - 1;
  const reachTop = t.eastWest ? mTop : mTop - 1;
  // Whole band within range (the common case): no per-cell range test.
  const checkRange = mTop * mTop + reachTop * reachTop > maxRange2;
  const qLo = Math.max(-reachTop, -minorObs);
  const qHi = Math.min(reachTop, minorLast - minorObs);
  if (t.eastWest) {
    // Grid rows are the minor axis: write row by row, the band's columns contiguous.
    for (let q = qLo; q <= qHi; q++) {
      const aq = q < 0 ? -q : q;
      const bStart = aq > m0 ? aq - m0 : 0;
      const rowBase = base + (minorObs + q) * minorStride;
      for (
        let b = bStart, oi = (rowBase + (m0 + bStart) * majorStride) | 0;
        b < nb;
        b++, oi = (oi + majorStride) | 0
      ) {
        const m = m0 + b;
        if (checkRange && m * m + q * q > maxRange2) continue;
        // Same sampling as the major-axis branch below; change both.
        const zc = z[oi];
        const nan = zc - zc;
        const u = q * rpm[b] + span;
        let j0 = u | 0;
        if (j0 > jMax) j0 = jMax;
        const f = u - j0;
        const ka = (Math.imul(j0, band2) + 2 * b) | 0;
        const a = rec[ka];
        const c = rec[(ka + band2) | 0];
        let v = a + (c - a) * f;
        const near = f < 0.5 ? ka : (ka + band2) | 0;
        if (!(v > NEG)) v = rec[near];
        outSlope[oi] = v + nan;
        outObstacleM[oi] = rec[(near + 1) | 0] + nan;
      }
    }
  } else {
    // Grid rows are the major axis: write line by line, the minor cells contiguous.
    for (let b = 0; b < nb; b++) {
      const m = m0 + b;
      let lo = Math.max(-(m - 1), -minorObs);
      let hi = Math.min(m - 1, minorLast - minorObs);
      if (checkRange) {
        // The line's cells within range: |q| ≤ √(range² − m²).
        const half = Math.floor(Math.sqrt(Math.max(0, maxRange2 - m * m)));
        if (m * m > maxRange2) continue;
        lo = Math.max(lo, -half);
        hi = Math.min(hi, half);
        while (lo <= hi && m * m + lo * lo > maxRange2) lo++;
        while (hi >= lo && m * m + hi * hi > maxRange2) hi--;
      }
      const lineBase = base + m * majorStride + minorObs * minorStride;
      const r = rpm[b];
      for (let q = lo, oi = (lineBase + lo) | 0; q <= hi; q++, oi = (oi + 1) | 0) {
        // Same sampling as the minor-axis branch above; change both.
        const zc = z[oi];
        const nan = zc - zc;
        const u = q * r + span;
        let j0 = u | 0;
        if (j0 > jMax) j0 = jMax;
        const f = u - j0;
        const ka = (Math.imul(j0, band2) + 2 * b) | 0;
        const a = rec[ka];
        const c = rec[(ka + band2) | 0];
        let v = a + (c - a) * f;
        const near = f < 0.5 ? ka : (ka + band2) | 0;
        if (!(v > NEG)) v = rec[near];
        outSlope[oi] = v + nan;
        outObstacleM[oi] = rec[(near + 1) | 0] + nan;
      }
    }
  }
}
