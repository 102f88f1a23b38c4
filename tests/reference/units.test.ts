import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  BOLTZMANN_J_PER_K,
  DEFAULT_EFFECTIVE_EARTH_FACTOR,
  EARTH_RADIUS_M,
  REFERENCE_TEMPERATURE_K,
  SPEED_OF_LIGHT_M_PER_S,
} from "../../src/coverage/constants.ts";
import { createGrid, sampleBilinear } from "../../src/coverage/grid.ts";
import {
  dbmToW,
  dbsmToM2,
  dbToLinear,
  degToRad,
  linearToDb,
  m2ToDbsm,
  radToDeg,
  wrapDeg180,
  wrapDeg360,
  wToDbm,
  wToDbw,
} from "../../src/coverage/units.ts";

describe("constants against their definitions", () => {
  it("[UN1] SI exact values (SI Brochure, 9th ed., 2019): c and k_B", () => {
    expect(SPEED_OF_LIGHT_M_PER_S).toBe(299_792_458);
    expect(BOLTZMANN_J_PER_K).toBe(1.380649e-23);
  });

  it("[UN1] kT0 = −174 dBm/Hz (common practice) and −204 dBW/Hz", () => {
    const kT0 = BOLTZMANN_J_PER_K * REFERENCE_TEMPERATURE_K;
    expect(wToDbm(kT0)).toBeCloseTo(-173.98, 2);
    expect(wToDbw(kT0)).toBeCloseTo(-203.98, 2);
  });

  it("[UN1] 4/3 Earth: effective radius ≈ 8495 km (ITU-R P.452: a_e = k·6371 km)", () => {
    expect((DEFAULT_EFFECTIVE_EARTH_FACTOR * EARTH_RADIUS_M) / 1000).toBeCloseTo(8494.67, 1);
  });
});

describe("unit conversions (IEEE Std 100 definition of the decibel; common practice)", () => {
  it("[UN2] table of familiar values", () => {
    expect(dbToLinear(3)).toBeCloseTo(1.9953, 4);
    expect(dbToLinear(-10)).toBeCloseTo(0.1, 12);
    expect(linearToDb(1000)).toBeCloseTo(30, 12);
    expect(dbmToW(30)).toBeCloseTo(1, 12);
    expect(dbmToW(0)).toBeCloseTo(1e-3, 15);
    expect(wToDbm(1e-3)).toBeCloseTo(0, 12);
    expect(wToDbw(100)).toBeCloseTo(20, 12);
    expect(dbsmToM2(-20)).toBeCloseTo(0.01, 14);
    expect(m2ToDbsm(1)).toBe(0);
    expect(degToRad(180)).toBe(Math.PI);
    expect(radToDeg(Math.PI / 2)).toBeCloseTo(90, 12);
  });

  it("[UN2] edges: 0 linear is −∞ dB, negative linear and NaN give NaN", () => {
    expect(linearToDb(0)).toBe(Number.NEGATIVE_INFINITY);
    expect(linearToDb(-1)).toBeNaN();
    expect(dbToLinear(Number.NaN)).toBeNaN();
  });

  it("[UN3] round trips and wrapping", () => {
    fc.assert(
      fc.property(fc.double({ min: -200, max: 200, noNaN: true }), (db) => {
        expect(linearToDb(dbToLinear(db))).toBeCloseTo(db, 9);
        expect(wToDbm(dbmToW(db))).toBeCloseTo(db, 9);
        expect(m2ToDbsm(dbsmToM2(db))).toBeCloseTo(db, 9);
      }),
    );
    fc.assert(
      fc.property(fc.double({ min: -1e4, max: 1e4, noNaN: true }), (deg) => {
        const a = wrapDeg360(deg);
        const b = wrapDeg180(deg);
        expect(a).toBeGreaterThanOrEqual(0);
        expect(a).toBeLessThan(360);
        expect(b).toBeGreaterThan(-180);
        expect(b).toBeLessThanOrEqual(180);
        expect(Math.abs(Math.cos(degToRad(a)) - Math.cos(degToRad(deg)))).toBeLessThan(1e-9);
        expect(Math.abs(Math.sin(degToRad(b)) - Math.sin(degToRad(deg)))).toBeLessThan(1e-9);
      }),
    );
  });
});

describe("grid sampling", () => {
  it("[GR1] bilinear interpolation reproduces a plane exactly and is NaN outside (common practice)", () => {
    const g = createGrid({ width: 4, height: 3, originX: 0, originY: 30, cellSizeM: 10, crs: "local" }, 0);
    for (let r = 0; r < 3; r++) for (let c = 0; c < 4; c++) g.data[r * 4 + c] = 2 * c - 3 * r + 5;
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 3, noNaN: true }),
        fc.double({ min: 0, max: 2, noNaN: true }),
        (c, r) => {
          expect(sampleBilinear(g, c, r)).toBeCloseTo(2 * c - 3 * r + 5, 5);
        },
      ),
    );
    expect(sampleBilinear(g, -0.1, 1)).toBeNaN();
    expect(sampleBilinear(g, 1, 2.01)).toBeNaN();
    g.data[5] = Number.NaN;
    expect(sampleBilinear(g, 1.5, 1.5)).toBeNaN();
  });
});
