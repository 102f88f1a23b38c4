/**
 * Maps the pixels of a Web-Mercator map tile back to the cells of the site grid.
 * Every pixel centre goes screen → lon/lat (spherical Mercator, as Leaflet's EPSG:3857) → grid frame
 * (proj4). proj4 runs exactly on a lattice every `latticeStepPx` pixels; pixels between lattice nodes are
 * interpolated bilinearly in grid coordinates, which over 8 px of a UTM or local frame errs by far less
 * than a millimetre (tests/dom/pixelToGrid.test.ts checks it against proj4 at every pixel).
 */
import proj4 from "proj4";
import type { GridFrame } from "../coverage/grid";
import { radToDeg } from "../coverage/units";

/** Forward projection from lon/lat degrees (WGS84) to the grid's projected x, y in metres. */
export type Forward = (lonDeg: number, latDeg: number) => [number, number];

/** A proj4 forward projection to `crs` (a proj4 string). */
export function forwardTo(crs: string): Forward {
  const conv = proj4("EPSG:4326", crs);
  return (lon, lat) => {
    const p = conv.forward([lon, lat]);
    return [p[0], p[1]];
  };
}

/** The inverse: grid x, y in metres to [lon, lat] degrees. */
export function inverseFrom(crs: string): (x: number, y: number) => [number, number] {
  const conv = proj4("EPSG:4326", crs);
  return (x, y) => {
    const p = conv.inverse([x, y]);
    return [p[0], p[1]];
  };
}

/**
 * Leaflet's pixel width of the world at zoom 0 (L.CRS.EPSG3857.scale(0)). It does not change with a
 * layer's tile size: a 512-px tile at zoom z covers the pixels of four 256-px tiles at z.
 */
const WORLD_PX_AT_ZOOM_0 = 256;

/** Longitude and latitude (degrees) of a global pixel position at zoom z (Leaflet's EPSG:3857 pixels). */
export function globalPixelToLonLat(px: number, py: number, zoom: number): [number, number] {
  const worldPx = WORLD_PX_AT_ZOOM_0 * 2 ** zoom;
  const lon = (px / worldPx) * 360 - 180;
  const latRad = Math.atan(Math.sinh(Math.PI * (1 - (2 * py) / worldPx)));
  return [lon, radToDeg(latRad)];
}

/** A tile address as Leaflet gives it. */
export interface TileAddress {
  x: number;
  y: number;
  z: number;
}

/**
 * For each pixel of the tile (row-major, tileSizePx²), the index of the grid cell under its centre
 * (row · width + col), or -1 where the pixel lies outside the grid.
 */
export function tileCellIndices(
  frame: GridFrame,
  forward: Forward,
  tile: TileAddress,
  tileSizePx: number,
  latticeStepPx = 8,
): Int32Array {
  const n = tileSizePx;
  const step = Math.max(1, Math.min(latticeStepPx, n));
  const nodes = Math.ceil(n / step) + 1;
  const gx = new Float64Array(nodes * nodes);
  const gy = new Float64Array(nodes * nodes);
  for (let j = 0; j < nodes; j++) {
    for (let i = 0; i < nodes; i++) {
      const [lon, lat] = globalPixelToLonLat(
        tile.x * n + i * step + 0.5,
        tile.y * n + j * step + 0.5,
        tile.z,
      );
      const [x, y] = forward(lon, lat);
      gx[j * nodes + i] = x;
      gy[j * nodes + i] = y;
    }
  }
  const out = new Int32Array(n * n);
  const inv = 1 / frame.cellSizeM;
  for (let py = 0; py < n; py++) {
    const j0 = Math.floor(py / step);
    const fy = (py - j0 * step) / step;
    for (let px = 0; px < n; px++) {
      const i0 = Math.floor(px / step);
      const fx = (px - i0 * step) / step;
      const a = j0 * nodes + i0;
      const b = a + 1;
      const c = a + nodes;
      const d = c + 1;
      const x = (gx[a] * (1 - fx) + gx[b] * fx) * (1 - fy) + (gx[c] * (1 - fx) + gx[d] * fx) * fy;
      const y = (gy[a] * (1 - fx) + gy[b] * fx) * (1 - fy) + (gy[c] * (1 - fx) + gy[d] * fx) * fy;
      const col = Math.floor((x - frame.originX) * inv);
      const row = Math.floor((frame.originY - y) * inv);
      out[py * n + px] =
        col >= 0 && row >= 0 && col < frame.width && row < frame.height ? row * frame.width + col : -1;
    }
  }
  return out;
}

/** The cell index under one lon/lat point, exactly (no lattice), or -1 outside. */
export function lonLatToCellIndex(
  frame: GridFrame,
  forward: Forward,
  lonDeg: number,
  latDeg: number,
): number {
  const [x, y] = forward(lonDeg, latDeg);
  const col = Math.floor((x - frame.originX) / frame.cellSizeM);
  const row = Math.floor((frame.originY - y) / frame.cellSizeM);
  return col >= 0 && row >= 0 && col < frame.width && row < frame.height ? row * frame.width + col : -1;
}
