/**
 * Exact reference ray march (R3, Franklin & Ray 1994): for one target cell, the straight sight line from
 * the observer's cell centre to the target's centre is sampled at every crossing with a column line and
 * every crossing with a row line strictly between the two, the surface there interpolated linearly
 * between the two cell centres the line passes between. Slow — O(distance) per cell — and used by the
 * tests as the yardstick of both sweeps (docs/model-spec.md TM7).
 */

import {
  curvatureFactorPerM,
  fillDistanceM,
  type HorizonResult,
  type MaskInput,
  ObserverOutsideGridError,
  observerCell,
} from "./terrainMask.ts";

/** Horizon of one cell: slope m/m (-Infinity if nothing obstructs) and obstacle distance m (NaN if none). */
export interface CellHorizon {
  slope: number;
  obstacleDistanceM: number;
}

/**
 * Exact horizon of the cell (col, row) for the observer of `input` (R3). Same rules as computeHorizon
 * (TM1–TM3): observer at its cell centre, own cell and footprint never obstruct, samples touching nodata
 * are skipped. Returns NaN slope for a nodata target, out of range or an observer outside the grid.
 */
export function rayMarchCell(input: MaskInput, col: number, row: number): CellHorizon {
  const res: CellHorizon = { slope: Number.NaN, obstacleDistanceM: Number.NaN };
  const cell = observerCell(input);
  const g = input.surface;
  const curv = curvatureFactorPerM(input.effectiveEarthFactor);
  if (cell === null || Number.isNaN(curv) || !Number.isFinite(input.antennaHeightAslM)) return res;
  const w = g.width;
  const z = g.data;
  if (Number.isNaN(z[row * w + col])) return res;
  const oc = cell.col;
  const or = cell.row;
  const dx = col - oc;
  const dy = row - or;
  const cs = g.cellSizeM;
  const totalM = Math.sqrt(dx * dx + dy * dy) * cs;
  const maxRangeM = input.maxRangeM ?? Number.POSITIVE_INFINITY;
  if (totalM > maxRangeM) return res;
  res.slope = Number.NEGATIVE_INFINITY;
  if (dx === 0 && dy === 0) return res;
  const exclM = input.ownFootprintRadiusM ?? 0;
  const antenna = input.antennaHeightAslM;
  const consider = (zz: number, t: number): void => {
    const s = t * totalM;
    if (!(s > exclM)) return;
    const slope = (zz - antenna) / s - s * curv;
    if (slope > res.slope) {
      res.slope = slope;
      res.obstacleDistanceM = s;
    }
  };
  // Column-line crossings: x = oc + k for k strictly between 0 and dx.
  const adx = Math.abs(dx);
  const sx = Math.sign(dx);
  for (let k = 1; k < adx; k++) {
    const t = k / adx;
    const c = oc + sx * k;
    const y = or + dy * t;
    let r0 = Math.floor(y);
    if (r0 >= g.height - 1) r0 = Math.max(0, g.height - 2);
    const f = y - r0;
    const za = z[r0 * w + c];
    const zb = g.height > 1 ? z[(r0 + 1) * w + c] : za;
    consider(za + (zb - za) * f, t);
  }
  // Row-line crossings: y = or + k for k strictly between 0 and dy.
  const ady = Math.abs(dy);
  const sy = Math.sign(dy);
  for (let k = 1; k < ady; k++) {
    const t = k / ady;
    const r = or + sy * k;
    const x = oc + dx * t;
    let c0 = Math.floor(x);
    if (c0 >= w - 1) c0 = Math.max(0, w - 2);
    const f = x - c0;
    const za = z[r * w + c0];
    const zb = w > 1 ? z[r * w + c0 + 1] : za;
    consider(za + (zb - za) * f, t);
  }
  return res;
}

/**
 * Exact horizon (R3) of the listed cells (row-major indices), or of every cell when `cells` is omitted.
 * Cells not listed stay NaN. Throws ObserverOutsideGridError like computeHorizon.
 */
export function rayMarchHorizon(input: MaskInput, cells?: ArrayLike<number>): HorizonResult {
  const cell = observerCell(input);
  if (cell === null) throw new ObserverOutsideGridError(input.observerX, input.observerY);
  const g = input.surface;
  const n = g.width * g.height;
  const out: HorizonResult = {
    horizonSlope: new Float32Array(n).fill(Number.NaN),
    obstacleDistanceM: new Float32Array(n).fill(Number.NaN),
    distanceM: new Float32Array(n),
    width: g.width,
    height: g.height,
    observerCol: cell.col,
    observerRow: cell.row,
  };
  fillDistanceM(out.distanceM, g, cell.col, cell.row);
  const count = cells ? cells.length : n;
  for (let i = 0; i < count; i++) {
    const idx = cells ? cells[i] : i;
    const r = rayMarchCell(input, idx % g.width, Math.floor(idx / g.width));
    out.horizonSlope[idx] = r.slope;
    out.obstacleDistanceM[idx] = r.obstacleDistanceM;
  }
  return out;
}
