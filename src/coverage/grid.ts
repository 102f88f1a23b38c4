/**
 * The site grid: one flat Float32Array raster in a local metric frame.
 * Row 0 is the northern edge (y decreases with row), like a north-up GeoTIFF.
 * Cell (col, row) has its centre at x = originX + (col + 0.5)·cellSizeM, y = originY − (row + 0.5)·cellSizeM.
 * NaN means nodata and never counts as visible or covered.
 */
export interface Grid {
  /** Cell values, row-major, length width·height. */
  data: Float32Array;
  /** Columns. */
  width: number;
  /** Rows. */
  height: number;
  /** x of the western edge (left of column 0), m, in the grid's projected frame. */
  originX: number;
  /** y of the northern edge (top of row 0), m, in the grid's projected frame. */
  originY: number;
  /** Square cell side, m. */
  cellSizeM: number;
  /** The projected frame as a proj4 string (e.g. "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs"). */
  crs: string;
}

/** The georeferencing of a grid without its data. */
export type GridFrame = Omit<Grid, "data">;

/** A new grid of the same frame filled with `fill` (default NaN). */
export function createGrid(frame: GridFrame, fill = Number.NaN): Grid {
  const data = new Float32Array(frame.width * frame.height);
  if (fill !== 0) data.fill(fill);
  return { ...frameOf(frame), data };
}

/** The frame of a grid (drops the data). */
export function frameOf(g: GridFrame): GridFrame {
  return {
    width: g.width,
    height: g.height,
    originX: g.originX,
    originY: g.originY,
    cellSizeM: g.cellSizeM,
    crs: g.crs,
  };
}

/** x of the centre of column `col`, m. */
export function cellCentreX(g: GridFrame, col: number): number {
  return g.originX + (col + 0.5) * g.cellSizeM;
}

/** y of the centre of row `row`, m. */
export function cellCentreY(g: GridFrame, row: number): number {
  return g.originY - (row + 0.5) * g.cellSizeM;
}

/** Fractional column of projected x (cell centres at integer + 0.5 → col index at centre = integer). */
export function xToCol(g: GridFrame, x: number): number {
  return (x - g.originX) / g.cellSizeM - 0.5;
}

/** Fractional row of projected y (centre of row r maps to r). */
export function yToRow(g: GridFrame, y: number): number {
  return (g.originY - y) / g.cellSizeM - 0.5;
}

/** Bilinear sample at fractional (col, row) in centre coordinates; NaN outside or next to nodata. */
export function sampleBilinear(g: Grid, col: number, row: number): number {
  if (!(col >= 0 && row >= 0 && col <= g.width - 1 && row <= g.height - 1)) return Number.NaN;
  const c0 = Math.min(Math.floor(col), Math.max(g.width - 2, 0));
  const r0 = Math.min(Math.floor(row), Math.max(g.height - 2, 0));
  const c1 = Math.min(c0 + 1, g.width - 1);
  const r1 = Math.min(r0 + 1, g.height - 1);
  const fc = col - c0;
  const fr = row - r0;
  const w = g.width;
  const v00 = g.data[r0 * w + c0];
  const v01 = g.data[r0 * w + c1];
  const v10 = g.data[r1 * w + c0];
  const v11 = g.data[r1 * w + c1];
  return (v00 * (1 - fc) + v01 * fc) * (1 - fr) + (v10 * (1 - fc) + v11 * fc) * fr;
}
