/**
 * Geodesy of the site grid against outside references:
 * - UTM coordinates and scale factors of 22 points from PROJ 9.1.1 (cs2cs, proj -S), cross-checked
 *   with GDAL 3.6.2 gdaltransform (fixture tests/fixtures/siteGrid/utm-points.json, made by
 *   make-utm-fixtures.py beside it);
 * - the zone rules (Norway 32V, Svalbard 31X–37X) against the independent `mgrs` library;
 * - the ellipsoidal transverse Mercator worked example of Snyder, Map Projections — A Working
 *   Manual (USGS Professional Paper 1395, 1987), numerical example for the ellipsoidal form (from memory);
 * - cell area on the metric grid against the geodesic area of the same cell on the WGS84 ellipsoid
 *   (GeographicLib, Karney 2013, via geographiclib-geodesic).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { Geodesic } from "geographiclib-geodesic";
import { forward as mgrsForward } from "mgrs";
import proj4 from "proj4";
import { describe, expect, it } from "vitest";
import { cellCentreX, cellCentreY, xToCol, yToRow } from "../../src/coverage/grid.ts";
import type { Plan } from "../../src/io/planSchema.ts";
import { siteGridFrame, utmZoneOf } from "../../src/io/siteGrid.ts";
import { examplePlan, squareAround } from "../unit/siteGridFixtures.ts";

interface UtmRow {
  lonDeg: number;
  latDeg: number;
  zone: number;
  south: boolean;
  eastingM: number;
  northingM: number;
  pointScaleK: number;
  arealScale: number;
}
const fixture: { points: UtmRow[] } = JSON.parse(
  readFileSync(join(import.meta.dirname, "../fixtures/siteGrid/utm-points.json"), "utf8"),
);
/** A validated plan whose only protected area is a small square centred on (lon, lat), with no posts. */
function planAt(lon: number, lat: number, halfDeg = 0.001, cellSizeM: number | "auto" = "auto"): Plan {
  return examplePlan((p) => {
    p.protectedAreas = [squareAround(lon, lat, halfDeg)];
    p.posts = [];
    p.approachRingDepthM = 500;
    p.analysis.cellSizeM = cellSizeM;
  });
}

function geodesicAreaM2(corners: [number, number][]): number {
  const poly = Geodesic.WGS84.Polygon(false);
  for (const [lon, lat] of corners) poly.AddPoint(lat, lon);
  // A polygon (not a polyline) always has an area; NaN would fail the checks below.
  return Math.abs(poly.Compute(false, true).area ?? Number.NaN);
}

describe("site grid geodesy (reference)", () => {
  it("[SG7] UTM coordinates of 22 points agree with PROJ cs2cs / GDAL gdaltransform to 1 mm", () => {
    for (const p of fixture.points) {
      const g = siteGridFrame(planAt(p.lonDeg, p.latDeg));
      expect(g.zone, `${p.lonDeg}, ${p.latDeg}`).toEqual({ zone: p.zone, south: p.south });
      const [x, y] = g.toGrid(p.lonDeg, p.latDeg);
      // proj4js and PROJ both use the Poder/Engsager (Krüger n-series) transverse Mercator, accurate to
      // well under 1 mm within a zone; 1 mm is a thousandth of the finest cell size.
      expect(Math.abs(x - p.eastingM), `easting ${p.lonDeg}, ${p.latDeg}`).toBeLessThan(1e-3);
      expect(Math.abs(y - p.northingM), `northing ${p.lonDeg}, ${p.latDeg}`).toBeLessThan(1e-3);
      const [lon, lat] = g.toLonLat(p.eastingM, p.northingM);
      // 1e-8 deg is about 1 mm on the ground.
      expect(Math.abs(lon - p.lonDeg)).toBeLessThan(1e-8);
      expect(Math.abs(lat - p.latDeg)).toBeLessThan(1e-8);
    }
  });

  it("[SG8] zone choice agrees with the mgrs library, including the Norway and Svalbard exceptions", () => {
    const check = (lon: number, lat: number) => {
      const ref = mgrsForward([lon, lat], 1);
      const m = /^(\d{1,2})([C-X])/.exec(ref);
      if (!m) throw new Error(ref);
      const z = utmZoneOf(lon, lat);
      expect(z?.zone, `${lon}, ${lat} → ${ref}`).toBe(Number(m[1]));
      expect(z?.south, `${lon}, ${lat} → ${ref}`).toBe(m[2] < "N");
    };
    // Dense lattice over the exception areas, offset from the exact boundaries.
    for (let lat = 54.05; lat < 66; lat += 0.5) for (let lon = 0.05; lon < 14; lon += 0.5) check(lon, lat);
    for (let lat = 70.05; lat < 84; lat += 0.5) for (let lon = -2.95; lon < 44; lon += 0.5) check(lon, lat);
    fc.assert(
      fc.property(
        fc.double({ min: -179.999, max: 179.999, noNaN: true }),
        fc.double({ min: -79.999, max: 83.999, noNaN: true }).filter((lat) => Math.abs(lat) > 1e-9),
        // The equator itself is a boundary: mgrs puts a vanishing negative latitude in band N.
        (lon, lat) => check(lon, lat),
      ),
      { numRuns: 3000 },
    );
  });

  it("[SG9] proj4's transverse Mercator reproduces Snyder's ellipsoidal worked example (from memory)", () => {
    // Snyder 1987: Clarke 1866 ellipsoid, φ = 40°30′ N, λ = 73°30′ W, λ0 = 75° W, k0 = 0.9996:
    // x = 127 106.5 m, y = 4 484 124.4 m, k = 0.9997989. Printed to 0.1 m, so the bound is 0.1 m.
    const [x, y] = proj4(
      "+proj=longlat +ellps=clrk66 +no_defs",
      "+proj=utm +zone=18 +ellps=clrk66 +units=m +no_defs",
      [-73.5, 40.5],
    );
    expect(Math.abs(x - 500000 - 127106.5)).toBeLessThan(0.1);
    expect(Math.abs(y - 4484124.4)).toBeLessThan(0.1);
  });

  it("[SG10] a cell's area on the grid equals its geodesic area times PROJ's areal scale factor", () => {
    for (const p of fixture.points) {
      for (const cellSizeM of [100, 1000]) {
        const g = siteGridFrame(planAt(p.lonDeg, p.latDeg, 0.01, cellSizeM));
        const [px, py] = g.toGrid(p.lonDeg, p.latDeg);
        const col = Math.round(xToCol(g.frame, px));
        const row = Math.round(yToRow(g.frame, py));
        const cx = cellCentreX(g.frame, col);
        const cy = cellCentreY(g.frame, row);
        const h = cellSizeM / 2;
        const corners = [
          g.toLonLat(cx - h, cy - h),
          g.toLonLat(cx + h, cy - h),
          g.toLonLat(cx + h, cy + h),
          g.toLonLat(cx - h, cy + h),
        ];
        const ratio = (cellSizeM * cellSizeM) / geodesicAreaM2(corners);
        // The scale varies by about |x − 500 km|·d/R² across the distance d between the point and the
        // cell centre (≤ 0.71 cell): ≤ 2e-5 for a 1 km cell at 430 km from the meridian; PROJ prints
        // the factor to 6 significant digits (±5e-7). Cell edges are straight on the grid, geodesics on
        // the ellipsoid; the difference of area is of second order (< 1e-9 relative at 1 km).
        expect(Math.abs(ratio - p.arealScale), `${p.lonDeg}, ${p.latDeg}, ${cellSizeM} m`).toBeLessThan(2e-5);
        // Within a UTM zone the grid overstates or understates true area by at most 0.25 %
        // (point scale 0.9996 on the central meridian to ≈ 1.001 at the zone edge on the equator).
        expect(Math.abs(ratio - 1)).toBeLessThan(2.5e-3);
      }
    }
  });
});
