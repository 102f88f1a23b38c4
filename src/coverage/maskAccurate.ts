/**
 * Accurate masking sweep (R2 class, Franklin & Ray 1994): straight rays from the observer's cell centre
 * to every cell of the perimeter, split into four triangles (east, west: |dy| ≤ |dx|; north, south:
 * |dx| < |dy|). In each triangle all rays advance together one grid line at a time (memory order, not
 * one ray after another); a ray samples the surface where it crosses the grid line, by linear
 * interpolation between the two cell centres it passes between, and keeps its running horizon.
 * A cell takes the horizon of the two rays that bracket its centre, interpolated linearly, before the
 * rays sample the cell's own line (the cell never masks itself). Rules TM1–TM7 in docs/model-spec.md.
 */

import type { SweepSetup } from "./terrainMask.ts";

/**
 * Rays per cell of the triangle's far edge. 1 puts one ray through every perimeter cell centre (R2); with
 * minor-line samples this keeps the lowest-visible-height error well inside the TM7 bounds.
 */
const RAYS_PER_PERIMETER_CELL = 1;

/** One triangle of the sweep: which axis advances (major) and how indices move. */
interface Triangle {
  /** Index step for one major step outward (±1 or ±width). */
  majorStride: number;
  /** Index step for one minor step (+1 or +width). */
  minorStride: number;
  /** Major steps available from the observer to the grid edge. */
  majorSteps: number;
  /** Observer position on the minor axis. */
  minorObs: number;
  /** Cells on the minor axis. */
  minorLen: number;
  /** East/west triangles include the diagonals |minor| = major; north/south stop one short. */
  includeDiagonal: boolean;
}

/** Working arrays reused by the four triangles (no allocation in the hot loops). */
interface RayBuffers {
  horizon: Float64Array;
  obstacleM: Float64Array;
  lengthPerStepM: Float64Array;
  invLengthPerStepM: Float64Array;
}

function buffers(maxRays: number): RayBuffers {
  return {
    horizon: new Float64Array(maxRays),
    obstacleM: new Float64Array(maxRays),
    lengthPerStepM: new Float64Array(maxRays),
    invLengthPerStepM: new Float64Array(maxRays),
  };
}

/**
 * Fills horizon slope (m/m) and obstacle distance (m) for every cell within range, accurate mode.
 * `outSlope` and `outObstacleM` arrive filled with NaN; nodata and out-of-range cells stay NaN.
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
  if (!Number.isNaN(s.z[obsIdx])) outSlope[obsIdx] = Number.NEGATIVE_INFINITY;
  const rangeSteps = Math.floor(s.maxRangeM / s.cellSizeM);
  const triangles: Triangle[] = [
    {
      majorStride: 1,
      minorStride: w,
      majorSteps: w - 1 - oc,
      minorObs: or,
      minorLen: h,
      includeDiagonal: true,
    },
    { majorStride: -1, minorStride: w, majorSteps: oc, minorObs: or, minorLen: h, includeDiagonal: true },
    { majorStride: -w, minorStride: 1, majorSteps: or, minorObs: oc, minorLen: w, includeDiagonal: false },
    {
      majorStride: w,
      minorStride: 1,
      majorSteps: h - 1 - or,
      minorObs: oc,
      minorLen: w,
      includeDiagonal: false,
    },
  ];
  let maxRays = 0;
  for (const t of triangles)
    maxRays = Math.max(maxRays, 2 * Math.min(t.majorSteps, rangeSteps) * RAYS_PER_PERIMETER_CELL + 1);
  const buf = buffers(maxRays);
  for (const t of triangles)
    sweepTriangle(s, t, Math.min(t.majorSteps, rangeSteps), obsIdx, buf, outSlope, outObstacleM);
}

function sweepTriangle(
  s: SweepSetup,
  t: Triangle,
  steps: number,
  obsIdx: number,
  buf: RayBuffers,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
): void {
  if (steps < 1) return;
  const z = s.z;
  const cell = s.cellSizeM;
  const antenna = s.antennaHeightAslM;
  const curv = s.curvaturePerM;
  const exclM = s.ownFootprintRadiusM;
  const maxRange2 = (s.maxRangeM / cell) * (s.maxRangeM / cell);
  const { majorStride, minorStride, minorObs, minorLen } = t;
  const minorLast = minorLen - 1;
  const span = steps * RAYS_PER_PERIMETER_CELL;
  const nRays = 2 * span + 1;
  const hz = buf.horizon;
  const od = buf.obstacleM;
  const len = buf.lengthPerStepM;
  const invLen = buf.invLengthPerStepM;
  // Ray j ends at minor offset (j − steps) on the last major line: slope per major step (j − steps)/steps.
  for (let j = 0; j < nRays; j++) {
    const slope = (j - span) / span;
    len[j] = cell * Math.sqrt(1 + slope * slope);
    invLen[j] = 1 / len[j];
    hz[j] = Number.NEGATIVE_INFINITY;
    od[j] = Number.NaN;
  }
  const invSpan = 1 / span;
  for (let m = 1; m <= steps; m++) {
    const lineBase = obsIdx + m * majorStride - minorObs * minorStride;
    // 1. Cells of this line take the bracketing rays' horizons (samples of lines 1..m−1 only).
    const reach = t.includeDiagonal ? m : m - 1;
    const lo = Math.max(-reach, -minorObs);
    const hi = Math.min(reach, minorLast - minorObs);
    const raysPerMinor = span / m;
    const m2 = m * m;
    for (let q = lo; q <= hi; q++) {
      const idx = lineBase + (minorObs + q) * minorStride;
      if (Number.isNaN(z[idx]) || m2 + q * q > maxRange2) continue;
      const u = q * raysPerMinor + span;
      let j0 = Math.floor(u);
      if (j0 >= nRays - 1) j0 = nRays - 2;
      const f = u - j0;
      const a = hz[j0];
      const b = hz[j0 + 1];
      let v = a + (b - a) * f;
      const near = f < 0.5 ? j0 : j0 + 1;
      if (!(v > Number.NEGATIVE_INFINITY)) v = hz[near];
      outSlope[idx] = v;
      outObstacleM[idx] = od[near];
    }
    // 2. Every ray inside the grid samples this line.
    const perRay = m * invSpan;
    let jLo = Math.ceil(span - minorObs / perRay);
    let jHi = Math.floor(span + (minorLast - minorObs) / perRay);
    if (jLo < 0) jLo = 0;
    if (jHi > nRays - 1) jHi = nRays - 1;
    const invM = 1 / m;
    for (let j = jLo; j <= jHi; j++) {
      const y = minorObs + (j - span) * perRay;
      let r0 = Math.floor(y);
      if (r0 >= minorLast) r0 = minorLast > 0 ? minorLast - 1 : 0;
      const f = y - r0;
      const i0 = lineBase + r0 * minorStride;
      const za = z[i0];
      const zb = minorLast > 0 ? z[i0 + minorStride] : za;
      const zz = za + (zb - za) * f;
      const dist = m * len[j];
      const slope = (zz - antenna) * invM * invLen[j] - dist * curv;
      if (slope > hz[j] && dist > exclM) {
        hz[j] = slope;
        od[j] = dist;
      }
      // The ray also crosses a minor grid line between major lines m−1 and m: sample it too (as R3 does).
      const rayStep = (j - span) * invSpan;
      const yPrev = y - rayStep;
      const kNow = Math.floor(y);
      const kPrev = Math.floor(yPrev);
      if (kNow !== kPrev) {
        const k = Math.max(kNow, kPrev);
        if (k >= 0 && k <= minorLast) {
          const g = (k - yPrev) / rayStep;
          const ik = lineBase + k * minorStride;
          const zp = z[ik - majorStride];
          const zk = zp + (z[ik] - zp) * g;
          const dk = (m - 1 + g) * len[j];
          const sk = (zk - antenna) / dk - dk * curv;
          if (sk > hz[j] && dk > exclM) {
            hz[j] = sk;
            od[j] = dk;
          }
        }
      }
    }
  }
}
