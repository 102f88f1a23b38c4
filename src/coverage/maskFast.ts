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
 * Speed: the distance, its reciprocal, the curvature drop and the interpolation weights depend only on
 * (|dx|, |dy|), so they are tabulated once per |dy| (one interleaved array) and serve the four cells
 * (±dx, ±dy). Each half row is split where the sight line changes the grid line it crosses (|dx| < |dy|,
 * the diagonal, |dx| > |dy|) and where the nearer of the two neighbours changes, so the inner loops carry
 * no branch on geometry; the rows |dy| north and south are swept in one pass, reading each table entry
 * once for both. A row's observable heights and obstacle distances share one interleaved array.
 */

import type { SweepSetup } from "./terrainMask.ts";

/** Table entries per |dx|: level, 1/distance, distance, two interpolation weights. */
const TS = 5;
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

/**
 * Row buffers of one direction (north or south), reused across rows: per column c the observable height
 * (m relative to the antenna) at [2c] and the distance of the obstruction that set it (m) at [2c + 1].
 */
interface RowBuffers {
  last: Float64Array;
  current: Float64Array;
}

function rowBuffers(w: number): RowBuffers {
  return { last: new Float64Array(2 * w), current: new Float64Array(2 * w) };
}

function swap(b: RowBuffers): void {
  const t = b.last;
  b.last = b.current;
  b.current = t;
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
  const north = rowBuffers(w);
  const south = rowBuffers(w);
  const reachMax = Math.max(oc, w - 1 - oc);
  const table = new Float64Array(TS * (reachMax + 1));
  const inv = new Float64Array(Math.max(s.width, s.height) + 1);
  for (let i = 1; i < inv.length; i++) inv[i] = 1 / i;
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
    const cLo = Math.max(0, oc - halfSpan);
    const cHi = Math.min(w - 1, oc + halfSpan);
    fillRowTable(table, inv, reach, ady, s);
    // Rows inside the footprint (and the first two) take the general path with every test.
    const general = ady <= 1 || ady * ady <= excl2;
    if (ady === 0) {
      sweepRowGeneral(s, north, table, inv, or, cLo, cHi, outSlope, outObstacleM);
      south.current.set(north.current);
      continue;
    }
    if (!general && ady <= nNorth && ady <= nSouth) {
      swap(north);
      swap(south);
      sweepRowPair(s, north, south, table, inv, ady, cLo, cHi, outSlope, outObstacleM);
      continue;
    }
    if (ady <= nNorth) {
      swap(north);
      if (general) sweepRowGeneral(s, north, table, inv, or - ady, cLo, cHi, outSlope, outObstacleM);
      else sweepRow(s, north, table, inv, or - ady, cLo, cHi, outSlope, outObstacleM);
    }
    if (ady <= nSouth) {
      swap(south);
      if (general) sweepRowGeneral(s, south, table, inv, or + ady, cLo, cHi, outSlope, outObstacleM);
      else sweepRow(s, south, table, inv, or + ady, cLo, cHi, outSlope, outObstacleM);
    }
  }
}

/**
 * The table of row |dy| = ady for |dx| = 0..reach. The drop is taken from the distance rather than from
 * dx² + dy²: V8 writes vsqrtsd into a register it also merges from, and with that ordering the square root
 * does not wait on the previous iteration's division.
 */
function fillRowTable(t: Float64Array, inv: Float64Array, reach: number, ady: number, s: SweepSetup): void {
  const cell = s.cellSizeM;
  const curv = s.curvaturePerM;
  const antenna = s.antennaHeightAslM;
  const ady2 = ady * ady;
  const invSteep = ady > 1 ? inv[ady - 1] : 0;
  for (let adx = 0, k = 0; adx <= reach; adx++, k += TS) {
    const dM = Math.sqrt(adx * adx + ady2) * cell;
    t[k + T_LEVEL] = antenna + dM * dM * curv;
    t[k + T_INV_DIST] = 1 / dM;
    t[k + T_DIST] = dM;
    if (adx < ady) {
      // Crosses row |dy|−1 between columns |dx|−1 (weight |dx|/(|dy|−1)) and |dx|.
      t[k + T_W_DIAG] = adx * invSteep;
      t[k + T_W_SIDE] = (ady - adx) * invSteep;
    } else if (adx === ady) {
      t[k + T_W_DIAG] = ady * invSteep;
      t[k + T_W_SIDE] = 0;
    } else {
      // Crosses column |dx|−1 between rows |dy|−1 (weight |dy|/(|dx|−1)) and |dy|.
      const invShallow = inv[adx - 1];
      t[k + T_W_DIAG] = ady * invShallow;
      t[k + T_W_SIDE] = (adx - ady) * invShallow;
    }
  }
}

/** One row with every test (observer's row, ring 1, footprint rows). */
function sweepRowGeneral(
  s: SweepSetup,
  b: RowBuffers,
  t: Float64Array,
  inv: Float64Array,
  row: number,
  cLo: number,
  cHi: number,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
): void {
  const w = s.width;
  const oc = s.observerCol;
  const cell = s.cellSizeM;
  const ady = Math.abs(row - s.observerRow);
  const z = s.z;
  const base = row * w;
  const excl2 = (s.ownFootprintRadiusM / cell) * (s.ownFootprintRadiusM / cell);
  const last = b.last;
  const cur = b.current;
  const ady2 = ady * ady;
  const NEG = Number.NEGATIVE_INFINITY;

  // Observer's column.
  {
    const idx = base + oc;
    const zc = z[idx];
    const rel = zc - t[T_LEVEL];
    let zp: number;
    let zo: number;
    if (ady <= 1) {
      zp = NEG;
      zo = Number.NaN;
    } else {
      zp = last[2 * oc] * ady * inv[ady - 1];
      zo = last[2 * oc + 1];
    }
    outSlope[idx] = Number.NaN;
    outObstacleM[idx] = Number.NaN;
    if (ady === 0) {
      // The observer's own cell never obstructs (TM2).
      cur[2 * oc] = NEG;
      cur[2 * oc + 1] = Number.NaN;
      if (!Number.isNaN(zc)) outSlope[idx] = NEG;
    } else {
      if (!Number.isNaN(zc)) {
        outSlope[idx] = zp * t[T_INV_DIST];
        outObstacleM[idx] = zo;
      }
      if (rel > zp && ady2 > excl2) {
        cur[2 * oc] = rel;
        cur[2 * oc + 1] = t[T_DIST];
      } else {
        cur[2 * oc] = zp;
        cur[2 * oc + 1] = zo;
      }
    }
  }
  // Right half (dir +1) and left half (dir −1). The values of the previous column (this row and the row
  // nearer the observer) ride along in locals rather than being read back from the buffers.
  for (let dir = 1; dir >= -1; dir -= 2) {
    const reach = dir > 0 ? cHi - oc : oc - cLo;
    let prevH = cur[2 * oc];
    let prevOd = cur[2 * oc + 1];
    let lastPrevH = last[2 * oc];
    let lastPrevOd = last[2 * oc + 1];
    for (let adx = 1; adx <= reach; adx++) {
      const c = oc + dir * adx;
      const idx = base + c;
      const zc = z[idx];
      const lastH = last[2 * c];
      const lastOdC = last[2 * c + 1];
      const d2 = adx * adx + ady2;
      const rel = zc - t[TS * adx + T_LEVEL];
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
        outSlope[idx] = zp * t[TS * adx + T_INV_DIST];
        outObstacleM[idx] = zo;
      } else {
        outSlope[idx] = Number.NaN;
        outObstacleM[idx] = Number.NaN;
      }
      if (rel > zp && d2 > excl2) {
        prevH = rel;
        prevOd = t[TS * adx + T_DIST];
      } else {
        prevH = zp;
        prevOd = zo;
      }
      cur[2 * c] = prevH;
      cur[2 * c + 1] = prevOd;
      lastPrevH = lastH;
      lastPrevOd = lastOdC;
    }
  }
}

/**
 * One row at |dy| ≥ 2 outside the footprint: the half rows in segments with no geometry test inside.
 * A nodata cell (NaN) writes NaN through `zc − zc` and never raises the observable height (NaN > x is false).
 */
function sweepRow(
  s: SweepSetup,
  b: RowBuffers,
  t: Float64Array,
  inv: Float64Array,
  row: number,
  cLo: number,
  cHi: number,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
): void {
  const oc = s.observerCol;
  const ady = Math.abs(row - s.observerRow);
  const z = s.z;
  const base = row * s.width;
  const last = b.last;
  const cur = b.current;
  // Literals: TurboFan folds them to float constants (a Number.* property load is unboxed in the loop).
  const NEG = -Infinity;
  const NAN = NaN;
  // Table offsets as locals: TurboFan folds them, where module constants are reloaded on every access.
  const tLevel = T_LEVEL;
  const tInvDist = T_INV_DIST;
  const tDist = T_DIST;
  const tWDiag = T_W_DIAG;
  const tWSide = T_W_SIDE;
  const ts = TS;

  // Observer's column: straight out along the column.
  // Same as the observer's column in sweepRowPair, which sweeps two rows at once; change both.
  {
    const idx = base + oc;
    const zc = z[idx];
    const rel = zc - t[tLevel];
    const zp = last[2 * oc] * ady * inv[ady - 1];
    const zo = last[2 * oc + 1];
    const nan = zc - zc;
    outSlope[idx] = zp * t[tInvDist] + nan;
    outObstacleM[idx] = zo + nan;
    const up = rel > zp;
    cur[2 * oc] = up ? rel : zp;
    cur[2 * oc + 1] = up ? t[tDist] : zo;
  }
  const halfSteep = (ady + 1) >> 1; // |dx| < halfSteep ⇔ 2|dx| < |dy|
  for (let dir = 1; dir >= -1; dir -= 2) {
    const reach = dir > 0 ? cHi - oc : oc - cLo;
    const dir2 = 2 * dir;
    let lastPrevH = last[2 * oc];
    let lastPrevOd = last[2 * oc + 1];
    let idx = base + oc;
    let cb = 2 * oc;
    let k = 0;
    // Steep part, |dx| < |dy|: the sight line crosses row |dy|−1 between columns |dx|−1 and |dx|.
    const steepEnd = Math.min(ady - 1, reach);
    const nearEnd = Math.min(halfSteep - 1, steepEnd);
    // Nearer neighbour: the same column of the previous row.
    // Same loop as this segment in sweepRowPair, which sweeps two rows at once; change both.
    for (let adx = 1; adx <= nearEnd; adx++) {
      idx += dir;
      cb += dir2;
      k += ts;
      const zc = z[idx];
      const lastH = last[cb];
      const lastOdC = last[cb + 1];
      const rel = zc - t[k + tLevel];
      const zp = lastPrevH * t[k + tWDiag] + lastH * t[k + tWSide];
      const zo = zp > NEG ? lastOdC : NAN;
      const nan = zc - zc;
      outSlope[idx] = zp * t[k + tInvDist] + nan;
      outObstacleM[idx] = zo + nan;
      if (rel > zp) {
        cur[cb] = rel;
        cur[cb + 1] = t[k + tDist];
      } else {
        cur[cb] = zp;
        cur[cb + 1] = zo;
      }
      lastPrevH = lastH;
      lastPrevOd = lastOdC;
    }
    // Nearer neighbour: the previous column of the previous row.
    // Same loop as this segment in sweepRowPair, which sweeps two rows at once; change both.
    for (let adx = nearEnd + 1; adx <= steepEnd; adx++) {
      idx += dir;
      cb += dir2;
      k += ts;
      const zc = z[idx];
      const lastH = last[cb];
      const lastOdC = last[cb + 1];
      const rel = zc - t[k + tLevel];
      const zp = lastPrevH * t[k + tWDiag] + lastH * t[k + tWSide];
      const zo = zp > NEG ? lastPrevOd : NAN;
      const nan = zc - zc;
      outSlope[idx] = zp * t[k + tInvDist] + nan;
      outObstacleM[idx] = zo + nan;
      if (rel > zp) {
        cur[cb] = rel;
        cur[cb + 1] = t[k + tDist];
      } else {
        cur[cb] = zp;
        cur[cb + 1] = zo;
      }
      lastPrevH = lastH;
      lastPrevOd = lastOdC;
    }
    if (reach < ady) continue;
    // Diagonal: straight through the previous diagonal cell.
    // Same loop as this segment in sweepRowPair, which sweeps two rows at once; change both.
    let prevH: number;
    let prevOd: number;
    {
      idx += dir;
      cb += dir2;
      k += ts;
      const zc = z[idx];
      const rel = zc - t[k + tLevel];
      const zp = lastPrevH * t[k + tWDiag];
      const zo = lastPrevOd;
      const nan = zc - zc;
      outSlope[idx] = zp * t[k + tInvDist] + nan;
      outObstacleM[idx] = zo + nan;
      if (rel > zp) {
        prevH = rel;
        prevOd = t[k + tDist];
      } else {
        prevH = zp;
        prevOd = zo;
      }
      cur[cb] = prevH;
      cur[cb + 1] = prevOd;
      lastPrevH = last[cb];
      lastPrevOd = last[cb + 1];
    }
    // Shallow part, |dx| > |dy|: the sight line crosses column |dx|−1 between rows |dy|−1 and |dy|.
    const farStart = Math.min(2 * ady, reach); // 2|dy| < |dx| beyond
    // Nearer neighbour: the previous column of the previous row.
    // Same loop as this segment in sweepRowPair, which sweeps two rows at once; change both.
    for (let adx = ady + 1; adx <= farStart; adx++) {
      idx += dir;
      cb += dir2;
      k += ts;
      const zc = z[idx];
      const lastH = last[cb];
      const lastOdC = last[cb + 1];
      const rel = zc - t[k + tLevel];
      const zp = lastPrevH * t[k + tWDiag] + prevH * t[k + tWSide];
      const zo = zp > NEG ? lastPrevOd : NAN;
      const nan = zc - zc;
      outSlope[idx] = zp * t[k + tInvDist] + nan;
      outObstacleM[idx] = zo + nan;
      if (rel > zp) {
        prevH = rel;
        prevOd = t[k + tDist];
      } else {
        prevH = zp;
        prevOd = zo;
      }
      cur[cb] = prevH;
      cur[cb + 1] = prevOd;
      lastPrevH = lastH;
      lastPrevOd = lastOdC;
    }
    // Nearer neighbour: the previous column of this row.
    // Same loop as this segment in sweepRowPair, which sweeps two rows at once; change both.
    for (let adx = farStart + 1; adx <= reach; adx++) {
      idx += dir;
      cb += dir2;
      k += ts;
      const zc = z[idx];
      const lastH = last[cb];
      const rel = zc - t[k + tLevel];
      const zp = lastPrevH * t[k + tWDiag] + prevH * t[k + tWSide];
      const zo = zp > NEG ? prevOd : NAN;
      const nan = zc - zc;
      outSlope[idx] = zp * t[k + tInvDist] + nan;
      outObstacleM[idx] = zo + nan;
      if (rel > zp) {
        prevH = rel;
        prevOd = t[k + tDist];
      } else {
        prevH = zp;
        prevOd = zo;
      }
      cur[cb] = prevH;
      cur[cb + 1] = prevOd;
      lastPrevH = lastH;
    }
  }
}

/**
 * The rows |dy| north and south of the observer (|dy| ≥ 2, outside the footprint) in one pass: the same
 * segments as sweepRow, each column's table entries read once for both rows.
 */
function sweepRowPair(
  s: SweepSetup,
  bn: RowBuffers,
  bs: RowBuffers,
  t: Float64Array,
  inv: Float64Array,
  ady: number,
  cLo: number,
  cHi: number,
  outSlope: Float32Array,
  outObstacleM: Float32Array,
): void {
  const oc = s.observerCol;
  const z = s.z;
  const baseN = (s.observerRow - ady) * s.width;
  const baseS = (s.observerRow + ady) * s.width;
  const lastN = bn.last;
  const curN = bn.current;
  const lastS = bs.last;
  const curS = bs.current;
  // Literals and locals: TurboFan folds them (module constants are reloaded on every access).
  const NEG = -Infinity;
  const NAN = NaN;
  const tLevel = T_LEVEL;
  const tInvDist = T_INV_DIST;
  const tDist = T_DIST;
  const tWDiag = T_W_DIAG;
  const tWSide = T_W_SIDE;
  const ts = TS;

  // Observer's column: straight out along the column.
  // Same as sweepRow's observer's column, for the north and south rows; change both.
  {
    const axis = ady * inv[ady - 1];
    const level = t[tLevel];
    const invD = t[tInvDist];
    const dM = t[tDist];
    const zn = z[baseN + oc];
    const zs = z[baseS + oc];
    const relN = zn - level;
    const relS = zs - level;
    const zpN = lastN[2 * oc] * axis;
    const zpS = lastS[2 * oc] * axis;
    const zoN = lastN[2 * oc + 1];
    const zoS = lastS[2 * oc + 1];
    const nanN = zn - zn;
    const nanS = zs - zs;
    outSlope[baseN + oc] = zpN * invD + nanN;
    outObstacleM[baseN + oc] = zoN + nanN;
    outSlope[baseS + oc] = zpS * invD + nanS;
    outObstacleM[baseS + oc] = zoS + nanS;
    const upN = relN > zpN;
    curN[2 * oc] = upN ? relN : zpN;
    curN[2 * oc + 1] = upN ? dM : zoN;
    const upS = relS > zpS;
    curS[2 * oc] = upS ? relS : zpS;
    curS[2 * oc + 1] = upS ? dM : zoS;
  }
  const halfSteep = (ady + 1) >> 1; // |dx| < halfSteep ⇔ 2|dx| < |dy|
  for (let dir = 1; dir >= -1; dir -= 2) {
    const reach = dir > 0 ? cHi - oc : oc - cLo;
    const dir2 = 2 * dir;
    let lpHN = lastN[2 * oc];
    let lpON = lastN[2 * oc + 1];
    let lpHS = lastS[2 * oc];
    let lpOS = lastS[2 * oc + 1];
    let c = oc;
    let cb = 2 * oc;
    let k = 0;
    const steepEnd = Math.min(ady - 1, reach);
    const nearEnd = Math.min(halfSteep - 1, steepEnd);
    // Steep part, nearer neighbour the same column of the previous row.
    // Same as sweepRow's steep part, same-column neighbour, for the north and south rows; change both.
    for (let adx = 1; adx <= nearEnd; adx++) {
      c += dir;
      cb += dir2;
      k += ts;
      const level = t[k + tLevel];
      const wd = t[k + tWDiag];
      const ws = t[k + tWSide];
      const invD = t[k + tInvDist];
      const zn = z[baseN + c];
      const zs = z[baseS + c];
      const lhN = lastN[cb];
      const loN = lastN[cb + 1];
      const lhS = lastS[cb];
      const loS = lastS[cb + 1];
      const zpN = lpHN * wd + lhN * ws;
      const zpS = lpHS * wd + lhS * ws;
      const zoN = zpN > NEG ? loN : NAN;
      const zoS = zpS > NEG ? loS : NAN;
      const nanN = zn - zn;
      const nanS = zs - zs;
      outSlope[baseN + c] = zpN * invD + nanN;
      outObstacleM[baseN + c] = zoN + nanN;
      outSlope[baseS + c] = zpS * invD + nanS;
      outObstacleM[baseS + c] = zoS + nanS;
      const relN = zn - level;
      const relS = zs - level;
      if (relN > zpN) {
        curN[cb] = relN;
        curN[cb + 1] = t[k + tDist];
      } else {
        curN[cb] = zpN;
        curN[cb + 1] = zoN;
      }
      if (relS > zpS) {
        curS[cb] = relS;
        curS[cb + 1] = t[k + tDist];
      } else {
        curS[cb] = zpS;
        curS[cb + 1] = zoS;
      }
      lpHN = lhN;
      lpON = loN;
      lpHS = lhS;
      lpOS = loS;
    }
    // Steep part, nearer neighbour the previous column of the previous row.
    // Same as sweepRow's steep part, previous-column neighbour, for the north and south rows; change both.
    for (let adx = nearEnd + 1; adx <= steepEnd; adx++) {
      c += dir;
      cb += dir2;
      k += ts;
      const level = t[k + tLevel];
      const wd = t[k + tWDiag];
      const ws = t[k + tWSide];
      const invD = t[k + tInvDist];
      const zn = z[baseN + c];
      const zs = z[baseS + c];
      const lhN = lastN[cb];
      const loN = lastN[cb + 1];
      const lhS = lastS[cb];
      const loS = lastS[cb + 1];
      const zpN = lpHN * wd + lhN * ws;
      const zpS = lpHS * wd + lhS * ws;
      const zoN = zpN > NEG ? lpON : NAN;
      const zoS = zpS > NEG ? lpOS : NAN;
      const nanN = zn - zn;
      const nanS = zs - zs;
      outSlope[baseN + c] = zpN * invD + nanN;
      outObstacleM[baseN + c] = zoN + nanN;
      outSlope[baseS + c] = zpS * invD + nanS;
      outObstacleM[baseS + c] = zoS + nanS;
      const relN = zn - level;
      const relS = zs - level;
      if (relN > zpN) {
        curN[cb] = relN;
        curN[cb + 1] = t[k + tDist];
      } else {
        curN[cb] = zpN;
        curN[cb + 1] = zoN;
      }
      if (relS > zpS) {
        curS[cb] = relS;
        curS[cb + 1] = t[k + tDist];
      } else {
        curS[cb] = zpS;
        curS[cb + 1] = zoS;
      }
      lpHN = lhN;
      lpON = loN;
      lpHS = lhS;
      lpOS = loS;
    }
    if (reach < ady) continue;
    // Diagonal: straight through the previous diagonal cell.
    // Same as sweepRow's diagonal, for the north and south rows; change both.
    let pHN: number;
    let pON: number;
    let pHS: number;
    let pOS: number;
    {
      c += dir;
      cb += dir2;
      k += ts;
      const level = t[k + tLevel];
      const wd = t[k + tWDiag];
      const invD = t[k + tInvDist];
      const dM = t[k + tDist];
      const zn = z[baseN + c];
      const zs = z[baseS + c];
      const zpN = lpHN * wd;
      const zpS = lpHS * wd;
      const nanN = zn - zn;
      const nanS = zs - zs;
      outSlope[baseN + c] = zpN * invD + nanN;
      outObstacleM[baseN + c] = lpON + nanN;
      outSlope[baseS + c] = zpS * invD + nanS;
      outObstacleM[baseS + c] = lpOS + nanS;
      const relN = zn - level;
      const relS = zs - level;
      if (relN > zpN) {
        pHN = relN;
        pON = dM;
      } else {
        pHN = zpN;
        pON = lpON;
      }
      if (relS > zpS) {
        pHS = relS;
        pOS = dM;
      } else {
        pHS = zpS;
        pOS = lpOS;
      }
      curN[cb] = pHN;
      curN[cb + 1] = pON;
      curS[cb] = pHS;
      curS[cb + 1] = pOS;
      lpHN = lastN[cb];
      lpON = lastN[cb + 1];
      lpHS = lastS[cb];
      lpOS = lastS[cb + 1];
    }
    const farStart = Math.min(2 * ady, reach); // 2|dy| < |dx| beyond
    // Shallow part, nearer neighbour the previous column of the previous row.
    // Same as sweepRow's shallow part, previous-row neighbour, for the north and south rows; change both.
    for (let adx = ady + 1; adx <= farStart; adx++) {
      c += dir;
      cb += dir2;
      k += ts;
      const level = t[k + tLevel];
      const wd = t[k + tWDiag];
      const ws = t[k + tWSide];
      const invD = t[k + tInvDist];
      const zn = z[baseN + c];
      const zs = z[baseS + c];
      const lhN = lastN[cb];
      const loN = lastN[cb + 1];
      const lhS = lastS[cb];
      const loS = lastS[cb + 1];
      const zpN = lpHN * wd + pHN * ws;
      const zpS = lpHS * wd + pHS * ws;
      const zoN = zpN > NEG ? lpON : NAN;
      const zoS = zpS > NEG ? lpOS : NAN;
      const nanN = zn - zn;
      const nanS = zs - zs;
      outSlope[baseN + c] = zpN * invD + nanN;
      outObstacleM[baseN + c] = zoN + nanN;
      outSlope[baseS + c] = zpS * invD + nanS;
      outObstacleM[baseS + c] = zoS + nanS;
      const relN = zn - level;
      const relS = zs - level;
      if (relN > zpN) {
        pHN = relN;
        pON = t[k + tDist];
      } else {
        pHN = zpN;
        pON = zoN;
      }
      if (relS > zpS) {
        pHS = relS;
        pOS = t[k + tDist];
      } else {
        pHS = zpS;
        pOS = zoS;
      }
      curN[cb] = pHN;
      curN[cb + 1] = pON;
      curS[cb] = pHS;
      curS[cb + 1] = pOS;
      lpHN = lhN;
      lpON = loN;
      lpHS = lhS;
      lpOS = loS;
    }
    // Shallow part, nearer neighbour the previous column of this row.
    // Same as sweepRow's shallow part, same-row neighbour, for the north and south rows; change both.
    for (let adx = farStart + 1; adx <= reach; adx++) {
      c += dir;
      cb += dir2;
      k += ts;
      const level = t[k + tLevel];
      const wd = t[k + tWDiag];
      const ws = t[k + tWSide];
      const invD = t[k + tInvDist];
      const zn = z[baseN + c];
      const zs = z[baseS + c];
      const lhN = lastN[cb];
      const lhS = lastS[cb];
      const zpN = lpHN * wd + pHN * ws;
      const zpS = lpHS * wd + pHS * ws;
      const zoN = zpN > NEG ? pON : NAN;
      const zoS = zpS > NEG ? pOS : NAN;
      const nanN = zn - zn;
      const nanS = zs - zs;
      outSlope[baseN + c] = zpN * invD + nanN;
      outObstacleM[baseN + c] = zoN + nanN;
      outSlope[baseS + c] = zpS * invD + nanS;
      outObstacleM[baseS + c] = zoS + nanS;
      const relN = zn - level;
      const relS = zs - level;
      if (relN > zpN) {
        pHN = relN;
        pON = t[k + tDist];
      } else {
        pHN = zpN;
        pON = zoN;
      }
      if (relS > zpS) {
        pHS = relS;
        pOS = t[k + tDist];
      } else {
        pHS = zpS;
        pOS = zoS;
      }
      curN[cb] = pHN;
      curN[cb + 1] = pON;
      curS[cb] = pHS;
      curS[cb + 1] = pOS;
      lpHN = lhN;
      lpHS = lhS;
    }
  }
}
