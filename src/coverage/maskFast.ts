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
 * `outSlope` and `outObstacleM` arrive filled with NaN; nodata and out-of-range cells stay NaN.
 */
export function computeHorizonFast(s: SweepSetup, outSlope: Float32Array, outObstacleM: Float32Array): void {
  const w = s.width;
  const bufs: RowBuffers = {
    lastHeight: new Float64Array(w),
    lastObstacle: new Float64Array(w),
    thisHeight: new Float64Array(w),
    thisObstacle: new Float64Array(w),
  };
  const inv = new Float64Array(Math.max(s.width, s.height) + 1);
  for (let i = 1; i < inv.length; i++) inv[i] = 1 / i;
  sweepRow(s, bufs, inv, s.observerRow, outSlope, outObstacleM);
  const firstHeight = bufs.thisHeight.slice();
  const firstObstacle = bufs.thisObstacle.slice();
  for (let r = s.observerRow - 1; r >= 0; r--) {
    swap(bufs);
    if (!sweepRow(s, bufs, inv, r, outSlope, outObstacleM)) break;
  }
  bufs.thisHeight.set(firstHeight);
  bufs.thisObstacle.set(firstObstacle);
  for (let r = s.observerRow + 1; r < s.height; r++) {
    swap(bufs);
    if (!sweepRow(s, bufs, inv, r, outSlope, outObstacleM)) break;
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
  // Right half (dir +1) and left half (dir −1).
  for (let dir = 1; dir >= -1; dir -= 2) {
    const end = dir > 0 ? cHi : cLo;
    for (let c = oc + dir; dir > 0 ? c <= end : c >= end; c += dir) {
      const adx = dir > 0 ? c - oc : oc - c;
      const idx = base + c;
      const zc = z[idx];
      const d2 = adx * adx + ady2;
      const rel = zc - antenna - d2 * curvCell2;
      let zp: number;
      let zo: number;
      if (adx <= 1 && ady <= 1) {
        zp = NEG;
        zo = Number.NaN;
      } else if (ady === 0) {
        zp = cur[c - dir] * adx * inv[adx - 1];
        zo = curOd[c - dir];
      } else if (adx === ady) {
        zp = last[c - dir] * adx * inv[adx - 1];
        zo = lastOd[c - dir];
      } else if (adx > ady) {
        // Crosses column adx−1 between rows ady−1 (weight ady/adx) and ady.
        zp = (last[c - dir] * ady + cur[c - dir] * (adx - ady)) * inv[adx - 1];
        zo = 2 * ady < adx ? curOd[c - dir] : lastOd[c - dir];
      } else {
        // Crosses row ady−1 between columns adx−1 (weight adx/ady) and adx.
        zp = (last[c - dir] * adx + last[c] * (ady - adx)) * inv[ady - 1];
        zo = 2 * adx < ady ? lastOd[c] : lastOd[c - dir];
      }
      const dCells = Math.sqrt(d2);
      if (!Number.isNaN(zc)) {
        outSlope[idx] = zp / (dCells * cell);
        outObstacleM[idx] = zo;
      }
      if (rel > zp && d2 > excl2) {
        cur[c] = rel;
        curOd[c] = dCells * cell;
      } else {
        cur[c] = zp;
        curOd[c] = zo;
      }
    }
  }
  return true;
}
