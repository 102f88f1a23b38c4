// @vitest-environment jsdom
import proj4 from "proj4";
import { describe, expect, it } from "vitest";
import type { GridFrame } from "../../src/coverage/grid";
import { buildColourTable } from "../../src/map/colourTable";
import {
  forwardTo,
  globalPixelToLonLat,
  lonLatToCellIndex,
  tileCellIndices,
} from "../../src/map/pixelToGrid";
import { renderTilePixels } from "../../src/map/rasterLayer";

const UTM33 = "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs";

/** A 400 × 300 grid of 5 m cells in UTM 33N around 15.3° E, 47.1° N. */
function frame(): GridFrame {
  const [x, y] = proj4("EPSG:4326", UTM33).forward([15.3, 47.1]);
  return { width: 400, height: 300, cellSizeM: 5, originX: x - 1000, originY: y + 750, crs: UTM33 };
}

/** Web-Mercator tile containing lon/lat at zoom z (slippy-map convention, as Leaflet uses). */
function tileOf(lon: number, lat: number, z: number) {
  const n = 2 ** z;
  const x = Math.floor(((lon + 180) / 360) * n);
  const latRad = (lat * Math.PI) / 180;
  const y = Math.floor(((1 - Math.log(Math.tan(latRad) + 1 / Math.cos(latRad)) / Math.PI) / 2) * n);
  return { x, y, z };
}

describe("pixel to grid mapping", () => {
  it("inverts the spherical Mercator of Leaflet (EPSG:3857) at tile corners", () => {
    // Tile (0,0) at zoom 0 spans ±180° and ±85.0511° (the Web-Mercator latitude limit, EPSG:3857).
    const [lonW, latN] = globalPixelToLonLat(0, 0, 0);
    expect(lonW).toBe(-180);
    expect(latN).toBeCloseTo(85.0511287798, 8);
    const [lonC, latC] = globalPixelToLonLat(128, 128, 0);
    expect(lonC).toBe(0);
    expect(latC).toBeCloseTo(0, 12);
    // Cross-check with proj4's own EPSG:3857 inverse at an arbitrary pixel.
    const z = 15;
    const px = 4_500_123.5;
    const py = 2_900_456.5;
    const world = 256 * 2 ** z;
    const half = Math.PI * 6378137;
    const mx = (px / world) * 2 * half - half;
    const my = half - (py / world) * 2 * half;
    const [plon, plat] = proj4("EPSG:3857", "EPSG:4326").forward([mx, my]);
    const [lon, lat] = globalPixelToLonLat(px, py, z);
    expect(lon).toBeCloseTo(plon, 9);
    expect(lat).toBeCloseTo(plat, 9);
  });

  it("gives every pixel the same cell as an exact proj4 mapping of its centre", () => {
    const f = frame();
    const fwd = forwardTo(f.crs);
    for (const z of [15, 17, 19]) {
      const t = tileOf(15.3, 47.1, z);
      const cells = tileCellIndices(f, fwd, t, 256);
      let disagree = 0;
      let inside = 0;
      for (let py = 0; py < 256; py++) {
        for (let px = 0; px < 256; px++) {
          const [lon, lat] = globalPixelToLonLat(t.x * 256 + px + 0.5, t.y * 256 + py + 0.5, z);
          const exact = lonLatToCellIndex(f, fwd, lon, lat);
          if (exact >= 0) inside++;
          if (exact !== cells[py * 256 + px]) disagree++;
        }
      }
      expect(inside).toBeGreaterThan(0);
      // The interpolated lattice may only differ where a pixel centre lies within a hair of a cell edge.
      expect(disagree / (256 * 256)).toBeLessThan(1e-3);
    }
  });

  it("maps a 512-px tile to the cells of the four 256-px tiles that cover the same pixels", () => {
    const f = frame();
    const fwd = forwardTo(f.crs);
    const z = 17;
    const t = tileOf(15.3, 47.1, z);
    // Leaflet's 512-px tile (x, y) at zoom z spans pixels [512x, 512x + 512) of the same zoom.
    const big = { x: t.x >> 1, y: t.y >> 1, z };
    const cells = tileCellIndices(f, fwd, big, 512);
    let inside = 0;
    // The four quadrants of the big tile: (dx, dy) = (0, 0), (1, 0), (0, 1), (1, 1).
    for (let q = 0; q < 4; q++) {
      const dx = q & 1;
      const dy = q >> 1;
      const small = tileCellIndices(f, fwd, { x: 2 * big.x + dx, y: 2 * big.y + dy, z }, 256);
      for (let py = 0; py < 256; py++)
        for (let px = 0; px < 256; px++) {
          const c = cells[(dy * 256 + py) * 512 + dx * 256 + px];
          if (c >= 0) inside++;
          expect(c).toBe(small[py * 256 + px]);
        }
    }
    expect(inside).toBeGreaterThan(0);
  });

  it("marks pixels outside the grid as -1 and keeps grid north up (row 0 at the top)", () => {
    const f = frame();
    const fwd = forwardTo(f.crs);
    const inv = proj4("EPSG:4326", f.crs);
    const [lonNW, latNW] = inv.inverse([f.originX + 2, f.originY - 2]);
    const [lonFar, latFar] = inv.inverse([f.originX - 500, f.originY + 500]);
    expect(lonLatToCellIndex(f, fwd, lonNW, latNW)).toBe(0);
    expect(lonLatToCellIndex(f, fwd, lonFar, latFar)).toBe(-1);
    const [lonSE, latSE] = inv.inverse([f.originX + f.width * 5 - 2, f.originY - f.height * 5 + 2]);
    expect(lonLatToCellIndex(f, fwd, lonSE, latSE)).toBe(f.width * f.height - 1);
  });

  it("paints nearest cells from the table, transparent for nodata, stripes for hatching", () => {
    const f: GridFrame = { ...frame(), width: 2, height: 1 };
    const table = buildColourTable("viridis");
    const cells = new Int32Array([0, 1, -1, 0]);
    const indices = new Int16Array([255, -1]);
    const out = new Uint8ClampedArray(16);
    renderTilePixels(
      out,
      cells,
      { frame: f, forward: forwardTo(f.crs), indices, table, pattern: "fill" },
      0,
      0,
      2,
    );
    expect(Array.from(out.slice(0, 4))).toEqual(Array.from(table.slice(255 * 4, 256 * 4)));
    expect(out[7]).toBe(0); // cell 1 is nodata
    expect(out[11]).toBe(0); // outside the grid
    expect(Array.from(out.slice(12, 16))).toEqual(Array.from(table.slice(255 * 4, 256 * 4)));
    const hatch = new Uint8ClampedArray(8 * 8 * 4);
    const all = new Int32Array(64).fill(0);
    renderTilePixels(
      hatch,
      all,
      { frame: f, forward: forwardTo(f.crs), indices, table, pattern: "hatch" },
      0,
      0,
      8,
    );
    let painted = 0;
    for (let p = 0; p < 64; p++) if (hatch[p * 4 + 3] > 0) painted++;
    expect(painted).toBe(16); // 2 of every 8 diagonals
    // The layer reuses one buffer tile after tile: every pixel is written, stale colour included.
    const reused = new Uint8ClampedArray(16).fill(200);
    renderTilePixels(
      reused,
      cells,
      { frame: f, forward: forwardTo(f.crs), indices, table, pattern: "fill" },
      0,
      0,
      2,
    );
    expect(Array.from(reused)).toEqual(Array.from(out));
    const stripes = new Uint8ClampedArray(8 * 8 * 4).fill(77);
    renderTilePixels(
      stripes,
      all,
      { frame: f, forward: forwardTo(f.crs), indices, table, pattern: "hatch" },
      0,
      0,
      8,
    );
    expect(Array.from(stripes)).toEqual(Array.from(hatch));
  });
});
