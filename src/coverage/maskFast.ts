/**
 * Fast masking sweep: one outward raster pass of the reference-plane family (Wang, Robinson & White,
 * "Generating viewsheds without using sightlines", PE&RS 66(1), 2000; XDraw, Franklin & Ray 1994).
 * Rows are visited from the observer's row outward (north, then south), each row from the observer's
 * column outward. Every cell keeps its "observable height" — the larger of its own curvature-corrected
 * height and the sight-line height projected through the two neighbours nearer the observer — and a cell's
 * horizon is that projection: the line from the antenna through the point where the sight line crosses the
 * previous grid line, interpolated between the two cells it passes between. Rules TM1–TM7, TM9 in
 * docs/model-spec.md.
 */

import type { SweepSetup } from "./terrainMask.ts";

/** Row buffers reused across rows (no allocation in the hot loops). */
interface RowBuffers {
  /** Observable height of the row nearer the observer, m relative to the antenna. */
  lastHeight: Float64Array;
  /** Distance of the obstruction that set lastHeight, m. */
  lastObstacle: Float64Array;
  thisHeight: Float64Array;
  thisObstacle: Float64Array;
}

/**
 * Fills horizon slope (m/m) and obstacle distance (m) for every cell within range, fast mode.
 * With `outDistanceM` (no range limit) every cell is written, NaN for nodata, and its distance too;
 * without it the outputs arrive filled with NaN and only cells in range with data are written.
 */
export function computeHorizonFast(
  s: SweepSetup,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
  outDistanceM: Float32Array | null,
): void {
  const w = s.width;
  const bufs: RowBuffers = {
    lastHeight: new Float64Array(w),
    lastObstacle: new Float64Array(w),
    thisHeight: new Float64Array(w),
    thisObstacle: new Float64Array(w),
  };
  const inv = new Float64Array(Math.max(s.width, s.height) + 1);
  for (let i = 1; i < inv.length; i++) inv[i] = 1 / i;
  sweepRow(s, bufs, inv, s.observerRow, outSlope, outObstacleM, outDistanceM);
  const firstHeight = bufs.thisHeight.slice();
  const firstObstacle = bufs.thisObstacle.slice();
  for (let r = s.observerRow - 1; r >= 0; r--) {
    swap(bufs);
    if (!sweepRow(s, bufs, inv, r, outSlope, outObstacleM, outDistanceM)) break;
  }
  bufs.thisHeight.set(firstHeight);
  bufs.thisObstacle.set(firstObstacle);
  for (let r = s.observerRow + 1; r < s.height; r++) {
    swap(bufs);
    if (!sweepRow(s, bufs, inv, r, outSlope, outObstacleM, outDistanceM)) break;
  }
}

function swap(b: RowBuffers): void {
  const h = b.lastHeight;
  b.lastHeight = b.thisHeight;
  b.thisHeight = h;
  const o = b.lastObstacle;
  b.lastObstacle = b.thisObstacle;
  b.thisObstacle = o;
}

/** One row; returns false when the whole row lies beyond the maximum range (farther rows do too). */
function sweepRow(
  s: SweepSetup,
  b: RowBuffers,
  inv: Float64Array,
  row: number,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
  outDistanceM: Float32Array | null,
): boolean {
  const w = s.width;
  const oc = s.observerCol;
  const cell = s.cellSizeM;
  const ady = Math.abs(row - s.observerRow);
  const rangeCells = s.maxRangeM / cell;
  if (ady > rangeCells) return false;
  // Columns within range on this row.
  const halfSpan = Number.isFinite(rangeCells)
    ? Math.floor(Math.sqrt(rangeCells * rangeCells - ady * ady))
    : w;
  const cLo = Math.max(0, oc - halfSpan);
  const cHi = Math.min(w - 1, oc + halfSpan);
  const z = s.z;
  const base = row * w;
  const antenna = s.antennaHeightAslM;
  const curvCell2 = s.curvaturePerM * cell * cell;
  const excl2 = (s.ownFootprintRadiusM / cell) * (s.ownFootprintRadiusM / cell);
  const last = b.lastHeight;
  const lastOd = b.lastObstacle;
  const cur = b.thisHeight;
  const curOd = b.thisObstacle;
  const ady2 = ady * ady;
  const NEG = Number.NEGATIVE_INFINITY;

  // Observer's column.
  {
    const idx = base + oc;
    const zc = z[idx];
    const dist = ady * cell;
    const rel = zc - antenna - ady2 * curvCell2;
    let zp: number;
    let zo: number;
    if (ady <= 1) {
      zp = NEG;
      zo = Number.NaN;
    } else {
      zp = last[oc] * ady * inv[ady - 1];
      zo = lastOd[oc];
    }
    if (outDistanceM) {
      outDistanceM[idx] = dist;
      outSlope[idx] = Number.NaN;
      outObstacleM[idx] = Number.NaN;
    }
    if (ady === 0) {
      // The observer's own cell never obstructs (TM2).
      cur[oc] = NEG;
      curOd[oc] = Number.NaN;
      if (!Number.isNaN(zc)) outSlope[idx] = NEG;
    } else {
      if (!Number.isNaN(zc)) {
        outSlope[idx] = (zp * inv[ady]) / cell;
        outObstacleM[idx] = zo;
      }
      if (rel > zp && ady2 > excl2) {
        cur[oc] = rel;
        curOd[oc] = dist;
      } else {
        cur[oc] = zp;
        curOd[oc] = zo;
      }
    }
  }
  // Right half (dir +1) and left half (dir −1). The values of the previous column (this row and the row
  // nearer the observer) ride along in locals rather than being read back from the buffers.
  for (let dir = 1; dir >= -1; dir -= 2) {
    const reach = dir > 0 ? cHi - oc : oc - cLo;
    let prevH = cur[oc];
    let prevOd = curOd[oc];
    let lastPrevH = last[oc];
    let lastPrevOd = lastOd[oc];
    for (let adx = 1; adx <= reach; adx++) {
      const c = oc + dir * adx;
      const idx = base + c;
      const zc = z[idx];
      const lastH = last[c];
      const lastOdC = lastOd[c];
      const d2 = adx * adx + ady2;
      const rel = zc - antenna - d2 * curvCell2;
      let zp: number;
      let zo: number;
      if (adx > ady) {
        if (ady === 0) {
          zp = adx === 1 ? NEG : prevH * adx * inv[adx - 1];
          zo = prevOd;
        } else if (adx === 1) {
          zp = NEG; // ring 1: nothing lies between
          zo = Number.NaN;
        } else {
          // Crosses column adx−1 between rows ady−1 (weight ady/adx) and ady.
          zp = (lastPrevH * ady + prevH * (adx - ady)) * inv[adx - 1];
          zo = 2 * ady < adx ? prevOd : lastPrevOd;
          // The nearer neighbour saw nothing (nodata or footprint): the obstacle is the other one's.
          if (Number.isNaN(zo)) zo = 2 * ady < adx ? lastPrevOd : prevOd;
        }
      } else if (adx === ady) {
        zp = adx === 1 ? NEG : lastPrevH * adx * inv[adx - 1];
        zo = lastPrevOd;
      } else {
        // Crosses row ady−1 between columns adx−1 (weight adx/ady) and adx.
        zp = (lastPrevH * adx + lastH * (ady - adx)) * inv[ady - 1];
        zo = 2 * adx < ady ? lastOdC : lastPrevOd;
        if (Number.isNaN(zo)) zo = 2 * adx < ady ? lastPrevOd : lastOdC;
      }
      if (!(zp > NEG)) zo = Number.NaN; // nothing obstructs: no obstacle distance
      const dM = Math.sqrt(d2) * cell;
      if (outDistanceM) outDistanceM[idx] = dM;
      if (!Number.isNaN(zc)) {
        outSlope[idx] = zp / dM;
        outObstacleM[idx] = zo;
      } else if (outDistanceM) {
        outSlope[idx] = Number.NaN;
        outObstacleM[idx] = Number.NaN;
      }
      if (rel > zp && d2 > excl2) {
        prevH = rel;
        prevOd = dM;
      } else {
        prevH = zp;
        prevOd = zo;
      }
      cur[c] = prevH;
      curOd[c] = prevOd;
      lastPrevH = lastH;
      lastPrevOd = lastOdC;
    }
  }
  return true;
}
