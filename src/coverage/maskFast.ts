/**
 * Fast masking sweep: one outward raster pass of the reference-plane family (Wang, Robinson & White,
 * "Generating viewsheds without using sightlines", PE&RS 66(1), 2000; XDraw, Franklin & Ray 1994).
 * Rows are visited from the observer's row outward, the row |dy| rows north and the row |dy| rows south
 * together, each row from the observer's column outward. Every cell keeps its "observable height" — the
 * larger of its own curvature-corrected height and the sight-line height projected through the two
 * neighbours nearer the observer — and a cell's horizon is that projection: the line from the antenna
 * through the point where the sight line crosses the previous grid line, interpolated between the two
 * cells it passes between. Rules TM1–TM7, TM9 in docs/model-spec.md.
 *
 * Speed: the four quadrants (NE, SE, NW, SW) are "lanes" that meet the same geometry at the same
 * (|dx|, |dy|), so they are advanced side by side, one loop iteration per |dx| for all four. One work
 * array indexed by |dx| (stride S) holds that row's table (distance, its reciprocal, the curvature drop,
 * the two interpolation weights) and each lane's observable height and obstacle distance for the previous
 * and the current row (two row sets that swap roles with the row's parity): one index serves every table
 * and state access, and a lane step carries no value from the previous column in registers. The work
 * array is a plain array of doubles, not a Float64Array: V8 keeps it unboxed (PACKED_DOUBLE_ELEMENTS) and
 * reaches its elements through one pointer, where a typed-array access adds the external pointer and
 * sign-extends the index every time (1.2× on the whole sweep). Each half row is split where the sight
 * line changes the grid line it crosses (|dx| < |dy|, the diagonal, |dx| > |dy|) and where the nearer of
 * the two neighbours changes; one loop serves the four resulting segments through the offsets of the two
 * neighbours it reads.
 */

import type { SweepSetup } from "./terrainMask.ts";

/** Stride of the work array per |dx|: 5 table entries, then 2 row sets × 4 lanes × (height, distance). */
const S = 21;
/** Antenna height plus the curvature drop, m ASL: a cell's height relative to the antenna is z − level. */
const T_LEVEL = 0;
/** 1 / distance, m⁻¹. */
const T_INV_DIST = 1;
/** Distance from the observer, m. */
const T_DIST = 2;
/** Weight of the neighbour on the previous row and column (|dx|−1, |dy|−1). */
const T_W_DIAG = 3;
/** Weight of the other neighbour: (|dx|, |dy|−1) where |dx| < |dy|, (|dx|−1, |dy|) where |dx| > |dy|. */
const T_W_SIDE = 4;
/** Offset of the row set of even |dy|; odd |dy| at +8. Within a set, lane q at +2q: height, then distance. */
const STATE = 5;
/** Lanes: the quadrant's offset within a row set. */
const LANE_NE = 0;
const LANE_SE = 2;
const LANE_NW = 4;
const LANE_SW = 6;

/** The output arrays and the surface, shared by every piece of a sweep. */
interface Target {
  z: Float32Array;
  outSlope: Float32Array;
  outObstacleM: Float32Array;
}

/**
 * Fills horizon slope (m/m) and obstacle distance (m) for every cell within range, fast mode: NaN for
 * nodata cells, -Infinity / NaN where nothing obstructs. Cells beyond the range are not written.
 */
export function computeHorizonFast(s: SweepSetup, outSlope: Float32Array, outObstacleM: Float32Array): void {
  const w = s.width;
  const oc = s.observerCol;
  const or = s.observerRow;
  const cell = s.cellSizeM;
  const reachMax = Math.max(oc, w - 1 - oc);
  // Filled with a double (not 0) so that V8 keeps the array unboxed from the start.
  const work: number[] = [];
  for (let i = 0; i < S * (reachMax + 1); i++) work.push(0.5);
  const inv = new Float64Array(Math.max(s.width, s.height) + 1);
  for (let i = 1; i < inv.length; i++) inv[i] = 1 / i;
  const target: Target = { z: s.z, outSlope, outObstacleM };
  const rangeCells = s.maxRangeM / cell;
  const exclCells = s.ownFootprintRadiusM / cell;
  const excl2 = exclCells * exclCells;
  const nNorth = or;
  const nSouth = s.height - 1 - or;
  const lastRow = Math.min(Math.max(nNorth, nSouth), Math.floor(rangeCells));
  for (let ady = 0; ady <= lastRow; ady++) {
    // Columns within range on this row.
    const halfSpan = Number.isFinite(rangeCells)
      ? Math.floor(Math.sqrt(rangeCells * rangeCells - ady * ady))
      : reachMax;
    const reach = Math.min(halfSpan, reachMax);
    const reachE = Math.min(w - 1, oc + halfSpan) - oc;
    const reachW = oc - Math.max(0, oc - halfSpan);
    fillRowTable(work, inv, reach, ady, s);
    const cur = STATE + 8 * (ady & 1);
    const last = STATE + 8 * ((ady + 1) & 1);
    const izN = (or - ady) * w + oc;
    const izS = (or + ady) * w + oc;
    // Rows inside the footprint (and the first two) take the general path with every test.
    if (ady <= 1 || ady * ady <= excl2) {
      if (ady <= nNorth) {
        generalRow(target, work, inv, izN, ady, reachE, reachW, cur + LANE_NE, cur + LANE_NW, last, excl2);
      }
      if (ady === 0) {
        // The observer's row starts both the north and the south sweeps.
        for (let k = 0; k <= S * reachMax; k += S) {
          work[k + cur + LANE_SE] = work[k + cur + LANE_NE];
          work[k + cur + LANE_SE + 1] = work[k + cur + LANE_NE + 1];
          work[k + cur + LANE_SW] = work[k + cur + LANE_NW];
          work[k + cur + LANE_SW + 1] = work[k + cur + LANE_NW + 1];
        }
      } else if (ady <= nSouth) {
        generalRow(target, work, inv, izS, ady, reachE, reachW, cur + LANE_SE, cur + LANE_SW, last, excl2);
      }
      continue;
    }
    const both = ady <= nNorth && ady <= nSouth;
    if (ady <= nNorth)
      observerColumn(target, work, inv, izN, ady, last + LANE_NE, cur, LANE_NE, LANE_NW, both);
    if (ady <= nSouth)
      observerColumn(target, work, inv, izS, ady, last + LANE_SE, cur, LANE_SE, LANE_SW, both);
    if (both) {
      // Four lanes while both halves are on the grid, then the longer half's two.
      const common = Math.min(reachE, reachW);
      sweepSegments(target, work, ady, 1, common, last, cur, izN, izS, 4);
      if (reachE > common) sweepSegments(target, work, ady, common + 1, reachE, last, cur, izN, izS, 2);
      if (reachW > common) sweepSegments(target, work, ady, common + 1, reachW, last, cur, izN, izS, -2);
    } else {
      const north = ady <= nNorth;
      const iz = north ? izN : izS;
      const laneE = north ? LANE_NE : LANE_SE;
      const laneW = north ? LANE_NW : LANE_SW;
      const common = Math.min(reachE, reachW);
      sweepSegmentsOneRow(target, work, ady, 1, common, last, cur, iz, 1, laneE, iz, -1, laneW);
      if (reachE > common)
        sweepSegmentsOneRow(target, work, ady, common + 1, reachE, last, cur, iz, 1, laneE, iz, 1, laneE);
      if (reachW > common)
        sweepSegmentsOneRow(target, work, ady, common + 1, reachW, last, cur, iz, -1, laneW, iz, -1, laneW);
    }
  }
}

/**
 * The table of row |dy| = ady for |dx| = 0..reach. The drop is taken from the distance rather than from
 * dx² + dy²: V8 writes vsqrtsd into a register it also merges from, and with that ordering the square root
 * does not wait on the previous iteration's division.
 */
function fillRowTable(t: number[], inv: Float64Array, reach: number, ady: number, s: SweepSetup): void {
  const cell = s.cellSizeM;
  const curv = s.curvaturePerM;
  const antenna = s.antennaHeightAslM;
  const ady2 = ady * ady;
  const invSteep = ady > 1 ? inv[ady - 1] : 0;
  // Locals: TurboFan reloads module constants from the context on every access.
  const stride = S;
  const tLevel = T_LEVEL;
  const tInv = T_INV_DIST;
  const tDist = T_DIST;
  const tDiag = T_W_DIAG;
  const tSide = T_W_SIDE;
  for (let adx = 0, k = 0; adx <= reach; adx++, k = (k + stride) | 0) {
    const dM = Math.sqrt(adx * adx + ady2) * cell;
    t[(k + tLevel) | 0] = antenna + dM * dM * curv;
    t[(k + tInv) | 0] = 1 / dM;
    t[(k + tDist) | 0] = dM;
    if (adx < ady) {
      // Crosses row |dy|−1 between columns |dx|−1 (weight |dx|/(|dy|−1)) and |dx|.
      t[(k + tDiag) | 0] = adx * invSteep;
      t[(k + tSide) | 0] = (ady - adx) * invSteep;
    } else if (adx === ady) {
      t[(k + tDiag) | 0] = ady * invSteep;
      t[(k + tSide) | 0] = 0;
    } else {
      // Crosses column |dx|−1 between rows |dy|−1 (weight |dy|/(|dx|−1)) and |dy|.
      const invShallow = inv[adx - 1];
      t[(k + tDiag) | 0] = ady * invShallow;
      t[(k + tSide) | 0] = (adx - ady) * invShallow;
    }
  }
}

/**
 * One row with every test (observer's row, ring 1, footprint rows): the observer's column, then each half
 * row outward. `laneE`/`laneW` are the absolute offsets of the current row's lanes, `last` the previous
 * row set's.
 */
function generalRow(
  tg: Target,
  work: number[],
  inv: Float64Array,
  iz: number,
  ady: number,
  reachE: number,
  reachW: number,
  laneE: number,
  laneW: number,
  last: number,
  excl2: number,
): void {
  const NEG = Number.NEGATIVE_INFINITY;
  const z = tg.z;
  const lastE = last + ((laneE - STATE) & 7);
  const lastW = last + ((laneW - STATE) & 7);
  // Observer's column.
  {
    const zc = z[iz];
    const rel = zc - work[T_LEVEL];
    let zp: number;
    let zo: number;
    if (ady <= 1) {
      zp = NEG;
      zo = Number.NaN;
    } else {
      zp = work[lastE] * ady * inv[ady - 1];
      zo = work[lastE + 1];
    }
    tg.outSlope[iz] = Number.NaN;
    tg.outObstacleM[iz] = Number.NaN;
    let h: number;
    let od: number;
    if (ady === 0) {
      // The observer's own cell never obstructs (TM2).
      h = NEG;
      od = Number.NaN;
      if (!Number.isNaN(zc)) tg.outSlope[iz] = NEG;
    } else {
      if (!Number.isNaN(zc)) {
        tg.outSlope[iz] = zp * work[T_INV_DIST];
        tg.outObstacleM[iz] = zo;
      }
      const up = rel > zp && ady * ady > excl2;
      h = up ? rel : zp;
      od = up ? work[T_DIST] : zo;
    }
    work[laneE] = h;
    work[laneE + 1] = od;
    work[laneW] = h;
    work[laneW + 1] = od;
  }
  generalHalfRow(tg, work, inv, iz, 1, ady, reachE, laneE, lastE, excl2);
  generalHalfRow(tg, work, inv, iz, -1, ady, reachW, laneW, lastW, excl2);
}

/** One half row of generalRow, outward in direction `dir` (±1). */
function generalHalfRow(
  tg: Target,
  work: number[],
  inv: Float64Array,
  iz: number,
  dir: number,
  ady: number,
  reach: number,
  lane: number,
  lastLane: number,
  excl2: number,
): void {
  const NEG = Number.NEGATIVE_INFINITY;
  const z = tg.z;
  const ady2 = ady * ady;
  // The values of the previous column (this row and the row nearer the observer).
  let prevH = work[lane];
  let prevOd = work[lane + 1];
  let lastPrevH = work[lastLane];
  let lastPrevOd = work[lastLane + 1];
  for (let adx = 1; adx <= reach; adx++) {
    const k = S * adx;
    const idx = iz + dir * adx;
    const zc = z[idx];
    const lastH = work[k + lastLane];
    const lastOdC = work[k + lastLane + 1];
    const d2 = adx * adx + ady2;
    const rel = zc - work[k + T_LEVEL];
    let zp: number;
    let zo: number;
    if (adx > ady) {
      if (ady === 0) {
        zp = adx === 1 ? NEG : prevH * adx * inv[adx - 1];
        zo = prevOd;
      } else {
        // Crosses column adx−1 between rows ady−1 (weight ady/adx) and ady.
        zp = (lastPrevH * ady + prevH * (adx - ady)) * inv[adx - 1];
        zo = 2 * ady < adx ? prevOd : lastPrevOd;
      }
    } else if (adx === ady) {
      zp = adx === 1 ? NEG : lastPrevH * adx * inv[adx - 1];
      zo = lastPrevOd;
    } else {
      // Crosses row ady−1 between columns adx−1 (weight adx/ady) and adx.
      zp = (lastPrevH * adx + lastH * (ady - adx)) * inv[ady - 1];
      zo = 2 * adx < ady ? lastOdC : lastPrevOd;
    }
    // Nothing obstructs: no obstacle distance. (A neighbour that saw nothing has a -Infinity height,
    // so the projection is -Infinity whenever the nearer neighbour's obstacle distance is NaN.)
    if (!(zp > NEG)) zo = Number.NaN;
    if (!Number.isNaN(zc)) {
      tg.outSlope[idx] = zp * work[k + T_INV_DIST];
      tg.outObstacleM[idx] = zo;
    } else {
      tg.outSlope[idx] = Number.NaN;
      tg.outObstacleM[idx] = Number.NaN;
    }
    if (rel > zp && d2 > excl2) {
      prevH = rel;
      prevOd = work[k + T_DIST];
    } else {
      prevH = zp;
      prevOd = zo;
    }
    work[k + lane] = prevH;
    work[k + lane + 1] = prevOd;
    lastPrevH = lastH;
    lastPrevOd = lastOdC;
  }
}

/**
 * Observer's column of a row at |dy| ≥ 2 outside the footprint: straight out along the column. Writes the
 * state of both lanes of that row side. `paired` selects the product order of the two-row sweep
 * (h·(|dy|/(|dy|−1))) over the one-row sweep's ((h·|dy|)/(|dy|−1)), which round differently.
 * A nodata cell (NaN) writes NaN through `zc − zc` and never raises the observable height.
 */
function observerColumn(
  tg: Target,
  work: number[],
  inv: Float64Array,
  iz: number,
  ady: number,
  lastLane: number,
  cur: number,
  laneE: number,
  laneW: number,
  paired: boolean,
): void {
  const zc = tg.z[iz];
  const rel = zc - work[T_LEVEL];
  const lastH = work[lastLane];
  const zp = paired ? lastH * (ady * inv[ady - 1]) : lastH * ady * inv[ady - 1];
  const zo = work[lastLane + 1];
  const nan = zc - zc;
  tg.outSlope[iz] = zp * work[T_INV_DIST] + nan;
  tg.outObstacleM[iz] = zo + nan;
  const up = rel > zp;
  const h = up ? rel : zp;
  const od = up ? work[T_DIST] : zo;
  work[cur + laneE] = h;
  work[cur + laneE + 1] = od;
  work[cur + laneW] = h;
  work[cur + laneW + 1] = od;
}

/**
 * The four segments of |dx| = lo..hi on row |dy| = ady, each [from, to, second, handed] (from > to when
 * empty): |dx| < |dy| with 2|dx| < |dy| (nearer neighbour the same column of the previous row), the rest of
 * |dx| < |dy| (the previous column of the previous row), |dy| < |dx| ≤ 2|dy| (the same), and 2|dy| < |dx|
 * (the previous column of this row). `second` and `handed` are the offsets, relative to a lane's entry at
 * |dx|, of the projection's second term and of the obstacle distance handed on. The diagonal |dx| = |dy|
 * lies between the second and the third segment.
 */
function segments(
  ady: number,
  lo: number,
  hi: number,
  last: number,
  cur: number,
): [number, number, number, number][] {
  const nearEnd = ((ady + 1) >> 1) - 1; // 2|dx| < |dy| up to here
  const steepSecond = last;
  const shallowSecond = cur - S;
  return [
    [lo, Math.min(hi, nearEnd), steepSecond, last + 1],
    [Math.max(lo, nearEnd + 1), Math.min(hi, ady - 1), steepSecond, last + 1 - S],
    [Math.max(lo, ady + 1), Math.min(hi, 2 * ady), shallowSecond, last + 1 - S],
    [Math.max(lo, 2 * ady + 1), hi, shallowSecond, cur + 1 - S],
  ];
}

/**
 * Cells |dx| = lo..hi of the rows |dy| north and south: `lanes` 4 = all four quadrants, 2 = the east
 * halves only (NE, SE), −2 = the west halves only (NW, SW), segment by segment, the diagonal between.
 */
function sweepSegments(
  tg: Target,
  work: number[],
  ady: number,
  lo: number,
  hi: number,
  last: number,
  cur: number,
  izN: number,
  izS: number,
  lanes: number,
): void {
  const pieces = segments(ady, lo, hi, last, cur);
  for (let p = 0; p < 4; p++) {
    const [a, b, second, handed] = pieces[p];
    if (p === 2 && lo <= ady && ady <= hi) {
      if (lanes !== -2) {
        diagonal(tg, work, ady, last, cur, izN + ady, LANE_NE);
        diagonal(tg, work, ady, last, cur, izS + ady, LANE_SE);
      }
      if (lanes !== 2) {
        diagonal(tg, work, ady, last, cur, izN - ady, LANE_NW);
        diagonal(tg, work, ady, last, cur, izS - ady, LANE_SW);
      }
    }
    if (a > b) continue;
    if (lanes === 4) sweep4(tg, work, a, b, izN, izS, last, second, handed, cur);
    else if (lanes === 2) sweep2(tg, work, a, b, izN, 1, LANE_NE, izS, 1, LANE_SE, last, second, handed, cur);
    else sweep2(tg, work, a, b, izN, -1, LANE_NW, izS, -1, LANE_SW, last, second, handed, cur);
  }
}

/** As sweepSegments, for one row side: lane A and lane B (which may be the same lane) of row base `iz…`. */
function sweepSegmentsOneRow(
  tg: Target,
  work: number[],
  ady: number,
  lo: number,
  hi: number,
  last: number,
  cur: number,
  izA: number,
  dirA: number,
  laneA: number,
  izB: number,
  dirB: number,
  laneB: number,
): void {
  const pieces = segments(ady, lo, hi, last, cur);
  for (let p = 0; p < 4; p++) {
    const [a, b, second, handed] = pieces[p];
    if (p === 2 && lo <= ady && ady <= hi) {
      diagonal(tg, work, ady, last, cur, izA + dirA * ady, laneA);
      if (laneB !== laneA) diagonal(tg, work, ady, last, cur, izB + dirB * ady, laneB);
    }
    if (a > b) continue;
    if (laneA === laneB) sweep1(tg, work, a, b, izA, dirA, laneA, last, second, handed, cur);
    else sweep2(tg, work, a, b, izA, dirA, laneA, izB, dirB, laneB, last, second, handed, cur);
  }
}

/** The diagonal cell |dx| = |dy| of one lane: straight through the previous diagonal cell. */
function diagonal(
  tg: Target,
  work: number[],
  ady: number,
  last: number,
  cur: number,
  idx: number,
  lane: number,
): void {
  const k = S * ady;
  const zc = tg.z[idx];
  const rel = zc - work[k + T_LEVEL];
  const zp = work[k - S + last + lane] * work[k + T_W_DIAG];
  const zo = work[k - S + last + lane + 1];
  const nan = zc - zc;
  tg.outSlope[idx] = zp * work[k + T_INV_DIST] + nan;
  tg.outObstacleM[idx] = zo + nan;
  const up = rel > zp;
  work[k + cur + lane] = up ? rel : zp;
  work[k + cur + lane + 1] = up ? work[k + T_DIST] : zo;
}

/**
 * |dx| = lo..hi of the four lanes (NE, SE, NW, SW) in one segment. Per lane at |dx| (entry k + lane):
 * projection = h(prev row, |dx|−1)·w_diag + h(entry k + lane + second)·w_side; the obstacle distance
 * handed on is entry k + lane + handed, or NaN where the projection is -Infinity (nothing obstructs), taken
 * without a branch as handed + (zp − zp): V8 keeps a NaN-or-load select boxed. A nodata cell (NaN) writes
 * NaN through `zc − zc` and never raises the observable height (NaN > x is false). Indices are `| 0` so
 * that TurboFan adds without overflow checks.
 */
function sweep4(
  tg: Target,
  work: number[],
  lo: number,
  hi: number,
  izN: number,
  izS: number,
  last: number,
  second: number,
  handed: number,
  cur: number,
): void {
  const z = tg.z;
  const outSlope = tg.outSlope;
  const outOd = tg.outObstacleM;
  const s = S;
  const first = last - s;
  const dSN = izS - izN;
  let k = s * lo;
  let e = izN + lo;
  let wc = izN - lo;
  for (let adx = lo; adx <= hi; adx++) {
    // The table entries T_LEVEL … T_W_SIDE, as literals (0 … 4).
    const level = work[k];
    const invD = work[(k + 1) | 0];
    const dM = work[(k + 2) | 0];
    const wd = work[(k + 3) | 0];
    const ws = work[(k + 4) | 0];
    const kf = (k + first) | 0;
    const ks = (k + second) | 0;
    const kh = (k + handed) | 0;
    const kc = (k + cur) | 0;
    // The four surface heights first: a load after a store whose address matches in its low 12 bits waits
    // for that store, and the north and south rows of a power-of-two-wide grid do.
    const iSE = (e + dSN) | 0;
    const iSW = (wc + dSN) | 0;
    const zNE = z[e];
    const zSE = z[iSE];
    const zNW = z[wc];
    const zSW = z[iSW];
    // NE
    {
      const zc = zNE;
      const zp = work[kf] * wd + work[ks] * ws;
      const hd = work[kh];
      const zo = hd + (zp - zp);
      const nan = zc - zc;
      outSlope[e] = zp * invD + nan;
      outOd[e] = zo + nan;
      const rel = zc - level;
      const up = rel > zp;
      work[kc] = up ? rel : zp;
      work[(kc + 1) | 0] = up ? dM : zo;
    }
    // SE
    {
      const i = iSE;
      const zc = zSE;
      const zp = work[(kf + 2) | 0] * wd + work[(ks + 2) | 0] * ws;
      const hd = work[(kh + 2) | 0];
      const zo = hd + (zp - zp);
      const nan = zc - zc;
      outSlope[i] = zp * invD + nan;
      outOd[i] = zo + nan;
      const rel = zc - level;
      const up = rel > zp;
      work[(kc + 2) | 0] = up ? rel : zp;
      work[(kc + 3) | 0] = up ? dM : zo;
    }
    // NW
    {
      const zc = zNW;
      const zp = work[(kf + 4) | 0] * wd + work[(ks + 4) | 0] * ws;
      const hd = work[(kh + 4) | 0];
      const zo = hd + (zp - zp);
      const nan = zc - zc;
      outSlope[wc] = zp * invD + nan;
      outOd[wc] = zo + nan;
      const rel = zc - level;
      const up = rel > zp;
      work[(kc + 4) | 0] = up ? rel : zp;
      work[(kc + 5) | 0] = up ? dM : zo;
    }
    // SW
    {
      const i = iSW;
      const zc = zSW;
      const zp = work[(kf + 6) | 0] * wd + work[(ks + 6) | 0] * ws;
      const hd = work[(kh + 6) | 0];
      const zo = hd + (zp - zp);
      const nan = zc - zc;
      outSlope[i] = zp * invD + nan;
      outOd[i] = zo + nan;
      const rel = zc - level;
      const up = rel > zp;
      work[(kc + 6) | 0] = up ? rel : zp;
      work[(kc + 7) | 0] = up ? dM : zo;
    }
    k = (k + s) | 0;
    e = (e + 1) | 0;
    wc = (wc - 1) | 0;
  }
}

/** As sweep4 for two lanes A and B (distinct), each with its own row base and direction. */
function sweep2(
  tg: Target,
  work: number[],
  lo: number,
  hi: number,
  izA: number,
  dirA: number,
  laneA: number,
  izB: number,
  dirB: number,
  laneB: number,
  last: number,
  second: number,
  handed: number,
  cur: number,
): void {
  const z = tg.z;
  const outSlope = tg.outSlope;
  const outOd = tg.outObstacleM;
  const s = S;
  const first = last - s + laneA;
  const secondA = second + laneA;
  const handedA = handed + laneA;
  const curA = cur + laneA;
  const dB = laneB - laneA;
  let k = s * lo;
  let ia = izA + dirA * lo;
  let ib = izB + dirB * lo;
  for (let adx = lo; adx <= hi; adx++) {
    // The table entries T_LEVEL … T_W_SIDE, as literals (0 … 4).
    const level = work[k];
    const invD = work[(k + 1) | 0];
    const dM = work[(k + 2) | 0];
    const wd = work[(k + 3) | 0];
    const ws = work[(k + 4) | 0];
    const zA = z[ia];
    const zB = z[ib];
    let kf = (k + first) | 0;
    let ks = (k + secondA) | 0;
    let kh = (k + handedA) | 0;
    let kc = (k + curA) | 0;
    // A
    {
      const zc = zA;
      const zp = work[kf] * wd + work[ks] * ws;
      const hd = work[kh];
      const zo = hd + (zp - zp);
      const nan = zc - zc;
      outSlope[ia] = zp * invD + nan;
      outOd[ia] = zo + nan;
      const rel = zc - level;
      const up = rel > zp;
      work[kc] = up ? rel : zp;
      work[(kc + 1) | 0] = up ? dM : zo;
    }
    kf = (kf + dB) | 0;
    ks = (ks + dB) | 0;
    kh = (kh + dB) | 0;
    kc = (kc + dB) | 0;
    // B
    {
      const zc = zB;
      const zp = work[kf] * wd + work[ks] * ws;
      const hd = work[kh];
      const zo = hd + (zp - zp);
      const nan = zc - zc;
      outSlope[ib] = zp * invD + nan;
      outOd[ib] = zo + nan;
      const rel = zc - level;
      const up = rel > zp;
      work[kc] = up ? rel : zp;
      work[(kc + 1) | 0] = up ? dM : zo;
    }
    k = (k + s) | 0;
    ia = (ia + dirA) | 0;
    ib = (ib + dirB) | 0;
  }
}

/** As sweep4 for one lane. */
function sweep1(
  tg: Target,
  work: number[],
  lo: number,
  hi: number,
  iz: number,
  dir: number,
  lane: number,
  last: number,
  second: number,
  handed: number,
  cur: number,
): void {
  const z = tg.z;
  const outSlope = tg.outSlope;
  const outOd = tg.outObstacleM;
  const s = S;
  const first = last - s + lane;
  const sec = second + lane;
  const hand = handed + lane;
  const c = cur + lane;
  let k = s * lo;
  let ia = iz + dir * lo;
  for (let adx = lo; adx <= hi; adx++) {
    // The table entries T_LEVEL … T_W_SIDE, as literals (0 … 4).
    const level = work[k];
    const invD = work[(k + 1) | 0];
    const dM = work[(k + 2) | 0];
    const wd = work[(k + 3) | 0];
    const ws = work[(k + 4) | 0];
    const kf = (k + first) | 0;
    const ks = (k + sec) | 0;
    const kh = (k + hand) | 0;
    const kc = (k + c) | 0;
    // the lane
    {
      const zc = z[ia];
      const zp = work[kf] * wd + work[ks] * ws;
      const hd = work[kh];
      const zo = hd + (zp - zp);
      const nan = zc - zc;
      outSlope[ia] = zp * invD + nan;
      outOd[ia] = zo + nan;
      const rel = zc - level;
      const up = rel > zp;
      work[kc] = up ? rel : zp;
      work[(kc + 1) | 0] = up ? dM : zo;
    }
    k = (k + s) | 0;
    ia = (ia + dir) | 0;
  }
}
