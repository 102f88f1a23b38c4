/**
 * Region masks on the site grid: the protected area and the approach ring around it.
 * Polygons arrive already in grid coordinates (projected metres of the grid frame); this module only
 * rasterises them and measures distances on the grid, so it stays pure.
 *
 * A cell belongs to a polygon when its centre lies inside (even–odd rule, so holes are honoured).
 * The approach ring holds the cells outside the protected area whose centre lies within the ring depth
 * of it, measured as the Euclidean distance from the cell centre to the nearest protected cell centre
 * less half a cell (the polygon edge lies between the two centres): exact to within half a cell.
 */
import type { GridFrame } from "./grid.ts";

/** A ring of a polygon as [x, y] vertices in grid metres (closed or not; the last edge is implied). */
export type RingXY = ReadonlyArray<readonly [number, number]>;
/** A polygon: outer ring first, then holes, as in GeoJSON. */
export type PolygonXY = ReadonlyArray<RingXY>;

/** The two regions the requirement applies to; 1 marks a member cell. The ring never overlaps the area. */
export interface RegionMasks {
  protectedArea: Uint8Array;
  approachRing: Uint8Array;
}

/**
 * Rasterise polygons (with holes) onto the grid: 1 where the cell centre is inside any polygon.
 * Empty input gives an all-zero mask. Vertices must be finite (validate at the edge).
 */
export function rasterisePolygons(
  frame: GridFrame,
  polygons: ReadonlyArray<PolygonXY>,
  out?: Uint8Array,
): Uint8Array {
  const { width, height, originX, originY, cellSizeM } = frame;
  const mask = out ?? new Uint8Array(width * height);
  const crossings: number[] = [];
  for (const polygon of polygons) {
    for (let row = 0; row < height; row++) {
      const y = originY - (row + 0.5) * cellSizeM;
      crossings.length = 0;
      for (const ring of polygon) {
        const n = ring.length;
        for (let i = 0, j = n - 1; i < n; j = i++) {
          const [xi, yi] = ring[i];
          const [xj, yj] = ring[j];
          // Half-open rule: an edge counts when y lies in [min, max) so shared vertices count once.
          if (yi > y !== yj > y) crossings.push(xi + ((y - yi) / (yj - yi)) * (xj - xi));
        }
      }
      if (crossings.length < 2) continue;
      crossings.sort((a, b) => a - b);
      for (let k = 0; k + 1 < crossings.length; k += 2) {
        // Columns whose centre x = originX + (col + 0.5)·cell lies in [x0, x1).
        const c0 = Math.max(0, Math.ceil((crossings[k] - originX) / cellSizeM - 0.5));
        const c1 = Math.min(width - 1, Math.ceil((crossings[k + 1] - originX) / cellSizeM - 0.5) - 1);
        for (let col = c0; col <= c1; col++) mask[row * width + col] = 1;
      }
    }
  }
  return mask;
}

/**
 * Squared Euclidean distance, in cells², from every cell centre to the nearest cell where `mask` is 1
 * (Infinity when the mask is empty). Exact, linear time: the lower envelope of parabolas of
 * Felzenszwalb & Huttenlocher, "Distance Transforms of Sampled Functions", Theory of Computing 8 (2012),
 * applied to columns, then rows.
 */
export function squaredDistanceToMaskCells(width: number, height: number, mask: Uint8Array): Float64Array {
  const n = width * height;
  const d2 = new Float64Array(n);
  for (let i = 0; i < n; i++) d2[i] = mask[i] ? 0 : Number.POSITIVE_INFINITY;
  const longest = Math.max(width, height);
  const f = new Float64Array(longest);
  const out = new Float64Array(longest);
  const v = new Int32Array(longest);
  const z = new Float64Array(longest + 1);
  // Columns.
  for (let col = 0; col < width; col++) {
    for (let row = 0; row < height; row++) f[row] = d2[row * width + col];
    transform1d(f, height, out, v, z);
    for (let row = 0; row < height; row++) d2[row * width + col] = out[row];
  }
  // Rows.
  for (let row = 0; row < height; row++) {
    const base = row * width;
    for (let col = 0; col < width; col++) f[col] = d2[base + col];
    transform1d(f, width, out, v, z);
    for (let col = 0; col < width; col++) d2[base + col] = out[col];
  }
  return d2;
}

/** One-dimensional squared distance transform of f[0..n) into out (Felzenszwalb & Huttenlocher, Alg. 1). */
function transform1d(f: Float64Array, n: number, out: Float64Array, v: Int32Array, z: Float64Array): void {
  let k = -1;
  for (let q = 0; q < n; q++) {
    if (f[q] === Number.POSITIVE_INFINITY) continue;
    if (k < 0) {
      k = 0;
      v[0] = q;
      z[0] = Number.NEGATIVE_INFINITY;
      z[1] = Number.POSITIVE_INFINITY;
      continue;
    }
    let s = (f[q] + q * q - (f[v[k]] + v[k] * v[k])) / (2 * q - 2 * v[k]);
    while (s <= z[k]) {
      k--;
      if (k < 0) break;
      s = (f[q] + q * q - (f[v[k]] + v[k] * v[k])) / (2 * q - 2 * v[k]);
    }
    if (k < 0) {
      k = 0;
      v[0] = q;
      z[0] = Number.NEGATIVE_INFINITY;
      z[1] = Number.POSITIVE_INFINITY;
      continue;
    }
    k++;
    v[k] = q;
    z[k] = s;
    z[k + 1] = Number.POSITIVE_INFINITY;
  }
  if (k < 0) {
    out.fill(Number.POSITIVE_INFINITY, 0, n);
    return;
  }
  let j = 0;
  for (let q = 0; q < n; q++) {
    while (z[j + 1] < q) j++;
    const dq = q - v[j];
    out[q] = dq * dq + f[v[j]];
  }
}

/**
 * The approach ring: cells outside the protected area within `ringDepthM` of it (see the module note).
 * ringDepthM ≤ 0 or NaN gives an empty ring.
 */
export function approachRingMask(
  frame: GridFrame,
  protectedArea: Uint8Array,
  ringDepthM: number,
): Uint8Array {
  const { width, height, cellSizeM } = frame;
  const ring = new Uint8Array(width * height);
  if (!(ringDepthM > 0)) return ring;
  const d2 = squaredDistanceToMaskCells(width, height, protectedArea);
  const limitCells = ringDepthM / cellSizeM + 0.5;
  const limit2 = limitCells * limitCells;
  for (let i = 0; i < ring.length; i++) if (!protectedArea[i] && d2[i] <= limit2) ring[i] = 1;
  return ring;
}

/** Both region masks from protected-area polygons in grid coordinates and the ring depth, m. */
export function buildRegionMasks(
  frame: GridFrame,
  protectedPolygons: ReadonlyArray<PolygonXY>,
  ringDepthM: number,
): RegionMasks {
  const protectedArea = rasterisePolygons(frame, protectedPolygons);
  return { protectedArea, approachRing: approachRingMask(frame, protectedArea, ringDepthM) };
}
