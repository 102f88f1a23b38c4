/**
 * Writes the synthetic DEM of the invented demo site demo-sites/ridge-waterworks: 600 × 600 cells
 * at 10 m in WGS 84 / UTM zone 53S (EPSG:32753), centred on the site, as a Float32 GeoTIFF.
 * Deterministic: the same file on every run (no random numbers; fixed sums of Gaussians and sines).
 *
 *   npx tsx scripts/make-demo-dem.ts
 *
 * The ground: a valley floor near 300 m, a north–south ridge 75 m high just east of the waterworks
 * (with a saddle to the north), a knoll to the north-west, a low hill to the south-east, a gentle
 * rise to the west and a few metres of roughness.
 */
import { writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import proj4 from "proj4";
import { encodeGeoTiff } from "../src/io/exportGeoTiff.ts";

/** The invented site's centre (open desert, no facility there). */
export const RIDGE_SITE_CENTRE = { lonDeg: 133.4, latDeg: -25.9 };
export const RIDGE_SITE_CRS = "+proj=utm +zone=53 +south +datum=WGS84 +units=m +no_defs";
export const RIDGE_DEM_SIZE = 600;
export const RIDGE_DEM_CELL_M = 10;

/** UTM easting/northing of the centre, rounded to whole cells so the DEM and site grid align. */
export function ridgeCentreUtm(): [number, number] {
  const [x, y] = proj4("WGS84", RIDGE_SITE_CRS, [RIDGE_SITE_CENTRE.lonDeg, RIDGE_SITE_CENTRE.latDeg]);
  return [
    Math.round(x / RIDGE_DEM_CELL_M) * RIDGE_DEM_CELL_M,
    Math.round(y / RIDGE_DEM_CELL_M) * RIDGE_DEM_CELL_M,
  ];
}

function gauss2(e: number, n: number, e0: number, n0: number, se: number, sn: number): number {
  const a = (e - e0) / se;
  const b = (n - n0) / sn;
  return Math.exp(-(a * a + b * b));
}

/** Ground elevation, m above sea level, at east/north offsets (m) from the site centre. */
export function ridgeGroundM(e: number, n: number): number {
  const valley = 300 + 0.012 * Math.max(0, -e);
  // The crest meanders a little around 430 m east of the centre.
  const crestE = 430 + 60 * Math.sin(n / 700) + 25 * Math.sin(n / 230 + 1);
  const ridgeAcross = Math.exp(-(((e - crestE) / 110) ** 2));
  const saddle = 1 - 0.45 * Math.exp(-(((n - 1300) / 250) ** 2));
  const ridge = 75 * ridgeAcross * saddle;
  const knoll = 95 * gauss2(e, n, -1700, 900, 380, 380);
  const hill = 40 * gauss2(e, n, 1200, -1500, 500, 400);
  // Roughness: fixed sines, a few metres, calmer on the waterworks platform.
  const rough =
    1.6 * Math.sin(0.0071 * e + 0.0023 * n + 0.4) +
    1.1 * Math.sin(0.0037 * e - 0.0089 * n + 1.9) +
    0.7 * Math.sin(0.0153 * e + 0.0121 * n + 2.7) +
    0.4 * Math.sin(0.031 * e - 0.027 * n + 0.9);
  const platform = 1 - 0.8 * gauss2(e, n, 0, 0, 350, 250);
  return valley + ridge + knoll + hill + rough * platform;
}

function main(): void {
  const [cx, cy] = ridgeCentreUtm();
  const size = RIDGE_DEM_SIZE;
  const cell = RIDGE_DEM_CELL_M;
  const originX = cx - (size / 2) * cell;
  const originY = cy + (size / 2) * cell;
  const data = new Float32Array(size * size);
  for (let row = 0; row < size; row++) {
    const n = originY - (row + 0.5) * cell - cy;
    for (let col = 0; col < size; col++) {
      const e = originX + (col + 0.5) * cell - cx;
      data[row * size + col] = ridgeGroundM(e, n);
    }
  }
  const buf = encodeGeoTiff({
    data,
    frame: { width: size, height: size, originX, originY, cellSizeM: cell, crs: RIDGE_SITE_CRS },
    description: "Ridge waterworks demo DEM (synthetic, invented), m above sea level",
  });
  const here = dirname(fileURLToPath(import.meta.url));
  const out = join(here, "..", "demo-sites", "ridge-waterworks", "terrain.tif");
  writeFileSync(out, new Uint8Array(buf));
  console.log(`wrote ${out} (${size} × ${size} at ${cell} m, origin ${originX}, ${originY})`);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) main();
