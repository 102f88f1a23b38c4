/**
 * Reference checks of the coverage stage against outside sources, each named beside its check:
 * - R⁻⁴ law of the monostatic radar equation (Skolnik, Introduction to Radar Systems, 3rd ed., eq. 1.6;
 *   common practice): 12.04 dB per doubling of range.
 * - Effective-Earth curvature drop d²/(2·k·a) with a = 6371 km (ITU-R P.452-17 eq. 6a for a_e = k·a).
 * - Single knife edge: v = h·√((2/λ)(1/d1 + 1/d2)) (ITU-R P.526-15 eq. 26) and
 *   J(v) = 6.9 + 20·log10(√((v − 0.1)² + 1) + v − 0.1) dB (ITU-R P.526-15 eq. 31); the loss enters the
 *   two-way radar equation twice (F⁴), here worked by hand from those two equations.
 */
import { describe, expect, it } from "vitest";
import { Reason } from "../../src/coverage/coverage.ts";
import { computeRadarCoverage, evaluatePoint } from "../../src/coverage/evaluate.ts";
import { cellXY, demoRadar, frameOf, placed, quad, siteOf } from "../unit/coverageFixtures.ts";

const KALVORI = demoRadar("kalvori-x9");
const LAMBDA_M = 299_792_458 / KALVORI.frequencyHz;

/** A row of 20 m cells on flat ground at 0 m; the radar at column 10, antenna 20 m ASL. */
function flatRow(k: number, wallCol?: number, wallTopM?: number) {
  const f = frameOf(600, 21, 20);
  const n = f.width * f.height;
  const ground = new Float32Array(n);
  const top = new Float32Array(n);
  if (wallCol !== undefined && wallTopM !== undefined)
    for (let r = 0; r < f.height; r++) top[r * f.width + wallCol] = wallTopM;
  const radar = placed(KALVORI, cellXY(f, 10, 10), 20);
  return {
    f,
    site: siteOf(f, ground, [radar], { top, k, heights: [20], targets: [{ ...quad, heightsAglM: [20] }] }),
  };
}

describe("coverage stage against published formulas", () => {
  it("[CV5] SNR falls 12.04 dB per doubling of range in free space (Skolnik eq. 1.6), gas loss aside", () => {
    const { f, site } = flatRow(Number.POSITIVE_INFINITY);
    const cov = computeRadarCoverage(site, 0, "accurate");
    const snr = cov.heights[0].snrDbAt0Dbsm;
    const at = (col: number) => snr[10 * f.width + col];
    // 2 km and 4 km east; the target at antenna height (elevation 0) on a flat Earth. The gas loss
    // (ITU-R P.676, atmosphere.ts) is taken out with the exact path's own figure.
    const p2 = evaluatePoint(site, { x: cellXY(f, 110, 10)[0], y: cellXY(f, 110, 10)[1] }, 20).rows[0];
    const p4 = evaluatePoint(site, { x: cellXY(f, 210, 10)[0], y: cellXY(f, 210, 10)[1] }, 20).rows[0];
    const gasDiffDb = p4.gasLossDb - p2.gasLossDb;
    // Bound: the SNR-in-dB table (≤ 0.002 dB) and the gas table bins (≤ 0.001 dB here).
    expect(at(110) - at(210) - gasDiffDb).toBeCloseTo(40 * Math.log10(2), 2);
  });

  it("[CV6] a target at antenna height 10 km away lies d²/(2ka) = 5.886 m below the sight line for k = 4/3 (ITU-R P.452 eq. 6a)", () => {
    const { f, site } = flatRow(4 / 3);
    const p = evaluatePoint(site, { x: cellXY(f, 510, 10)[0], y: cellXY(f, 510, 10)[1] }, 20).rows[0];
    const d = 500 * 20;
    expect(p.geometry.distanceM).toBeCloseTo(d, 6);
    // 10 000² / (2 · 4/3 · 6 371 000) = 5.8860 m.
    expect(p.geometry.heightAboveAntennaM).toBeCloseTo(-5.886, 3);
    expect(p.geometry.elevationDeg).toBeCloseTo((Math.atan2(-5.886, d) * 180) / Math.PI, 4);
  });

  it("[CV7] a grazing knife edge (v = 0) costs 2·J(0) = 12.06 dB two way (ITU-R P.526-15 eq. 31)", () => {
    // Wall top at antenna height halfway to the target, flat Earth: the sight line grazes it.
    const clear = computeRadarCoverage(flatRow(Number.POSITIVE_INFINITY).site, 0, "accurate");
    const { f, site } = flatRow(Number.POSITIVE_INFINITY, 60, 20);
    const walled = computeRadarCoverage(site, 0, "accurate");
    const i = 10 * f.width + 110;
    const jZeroDb = 6.9 + 20 * Math.log10(Math.sqrt(0.01 + 1) - 0.1); // 6.033 dB
    // Bound: knife-edge table step 0.005 in v near v = 0 (≤ 0.044 dB two way) plus the dB table.
    expect(clear.heights[0].snrDbAt0Dbsm[i] - walled.heights[0].snrDbAt0Dbsm[i]).toBeCloseTo(2 * jZeroDb, 1);
  });

  it("[CV8] a wall 10 m above the sight line halfway along 2 km: v = 3.54, two-way loss 47.7 dB, the cell masked (P.526 eqs. 26, 31)", () => {
    const clear = computeRadarCoverage(flatRow(Number.POSITIVE_INFINITY).site, 0, "accurate");
    const { f, site } = flatRow(Number.POSITIVE_INFINITY, 60, 30);
    const walled = computeRadarCoverage(site, 0, "accurate");
    const i = 10 * f.width + 110;
    const d1 = 1000;
    const d2 = 1000;
    const v = 10 * Math.sqrt((2 / LAMBDA_M) * (1 / d1 + 1 / d2));
    const j = 6.9 + 20 * Math.log10(Math.sqrt((v - 0.1) ** 2 + 1) + v - 0.1);
    // λ = c/9.4 GHz = 31.9 mm: v = 10·√(62.7 · 0.002) = 3.541; J = 6.9 + 20·log10(3.583 + 3.441) = 23.83 dB.
    expect(v).toBeCloseTo(3.541, 2);
    expect(j).toBeCloseTo(23.83, 1);
    const p = evaluatePoint(site, { x: cellXY(f, 110, 10)[0], y: cellXY(f, 110, 10)[1] }, 20).rows[0];
    expect(p.fresnelV).toBeCloseTo(v, 3);
    expect(p.diffractionLossTwoWayDb).toBeCloseTo(2 * j, 2);
    // The raster agrees within its table step (v step 0.005 → < 0.02 dB one way at v ≈ 3.5).
    expect(clear.heights[0].snrDbAt0Dbsm[i] - walled.heights[0].snrDbAt0Dbsm[i]).toBeCloseTo(2 * j, 0);
    expect(walled.heights[0].targets[0].reason![i]).toBe(Reason.masked);
  });
});
