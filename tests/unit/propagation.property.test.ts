import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { gaseousAttenuationDbPerKm, twoWayGasLossDb } from "../../src/coverage/atmosphere.ts";
import { fresnelIntegrals, knifeEdgeLossExactDb } from "../../src/coverage/fresnelIntegrals.ts";
import {
  curvatureDropM,
  freeSpaceLossDb,
  fresnelParameterV,
  fresnelZoneRadiusM,
  knifeEdgeLossDb,
  radarHorizonM,
} from "../../src/coverage/propagation.ts";
import { rainAttenuationDbPerKm } from "../../src/coverage/rain.ts";
import { complianceDistanceM, powerDensityWPerM2 } from "../../src/coverage/rfExposure.ts";

const frequencyHz = fc.double({ min: 1e8, max: 3e11, noNaN: true });
const distanceM = fc.double({ min: 1, max: 1e6, noNaN: true });
const heightM = fc.double({ min: 0, max: 3000, noNaN: true });
const factor = fc.double({ min: 1.0001, max: 10, noNaN: true });

describe("Propagation properties", () => {
  it("[PR1] free-space loss grows with distance and with frequency, 6.02 dB per doubling of either", () => {
    fc.assert(
      fc.property(frequencyHz, distanceM, factor, (f, d, m) => {
        const l = freeSpaceLossDb({ frequencyHz: f, distanceM: d });
        expect(freeSpaceLossDb({ frequencyHz: f, distanceM: d * m })).toBeGreaterThan(l);
        expect(freeSpaceLossDb({ frequencyHz: f * m, distanceM: d })).toBeGreaterThan(l);
        expect(freeSpaceLossDb({ frequencyHz: f, distanceM: 2 * d }) - l).toBeCloseTo(20 * Math.log10(2), 9);
        expect(freeSpaceLossDb({ frequencyHz: 2 * f, distanceM: d }) - l).toBeCloseTo(20 * Math.log10(2), 9);
      }),
    );
  });

  it("[PR4] the radar horizon grows with both heights and with k", () => {
    fc.assert(
      fc.property(heightM, heightM, fc.double({ min: 0.01, max: 100, noNaN: true }), (h1, h2, dh) => {
        const base = radarHorizonM({ antennaHeightM: h1, targetHeightM: h2 });
        expect(radarHorizonM({ antennaHeightM: h1 + dh, targetHeightM: h2 })).toBeGreaterThan(base);
        expect(radarHorizonM({ antennaHeightM: h1, targetHeightM: h2 + dh })).toBeGreaterThan(base);
        if (h1 + h2 > 0) {
          expect(radarHorizonM({ antennaHeightM: h1, targetHeightM: h2, k: 2 })).toBeGreaterThan(
            radarHorizonM({ antennaHeightM: h1, targetHeightM: h2, k: 1 }),
          );
        }
        // Symmetric in the two heights.
        expect(radarHorizonM({ antennaHeightM: h2, targetHeightM: h1 })).toBeCloseTo(base, 6);
      }),
    );
  });

  it("[PR2] curvature drop and horizon are inverse: drop(horizon(h, 0)) = h", () => {
    fc.assert(
      fc.property(heightM, fc.double({ min: 0.5, max: 4, noNaN: true }), (h, k) => {
        const d = radarHorizonM({ antennaHeightM: h, targetHeightM: 0, k });
        expect(Math.abs(curvatureDropM(d, k) - h)).toBeLessThanOrEqual(1e-9 * Math.max(1, h));
      }),
    );
  });

  it("[PR8] J(v) of the P.526 approximation never decreases with v and is never negative", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 200, noNaN: true }),
        fc.double({ min: 1e-6, max: 10, noNaN: true }),
        (v, dv) => {
          const j = knifeEdgeLossDb(v);
          expect(j).toBeGreaterThanOrEqual(0);
          expect(knifeEdgeLossDb(v + dv)).toBeGreaterThanOrEqual(j);
        },
      ),
    );
  });

  it("[PR7] the exact J(v) rises with v in the shadow (v ≥ 0), and C, S are odd", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 100, noNaN: true }),
        fc.double({ min: 1e-3, max: 10, noNaN: true }),
        (v, dv) => {
          expect(knifeEdgeLossExactDb(v + dv)).toBeGreaterThan(knifeEdgeLossExactDb(v));
          const p = fresnelIntegrals(v);
          const n = fresnelIntegrals(-v);
          expect(n.c + p.c).toBe(0);
          expect(n.s + p.s).toBe(0);
        },
      ),
    );
  });

  it("[PR6] v has the sign of the clearance and grows with it; loss grows as an edge rises into the path", () => {
    fc.assert(
      fc.property(
        // Clearances far below a nanometre underflow v to 0 and carry no meaning: excluded.
        fc.double({ min: -50, max: 50, noNaN: true }).filter((h) => Math.abs(h) > 1e-9),
        fc.double({ min: 0.01, max: 20, noNaN: true }),
        distanceM,
        distanceM,
        (h, dh, d1, d2) => {
          const w = 0.03;
          const v = fresnelParameterV({ clearanceM: h, d1M: d1, d2M: d2, wavelengthM: w });
          expect(Math.sign(v)).toBe(Math.sign(h));
          const v2 = fresnelParameterV({ clearanceM: h + dh, d1M: d1, d2M: d2, wavelengthM: w });
          expect(v2).toBeGreaterThan(v);
          expect(knifeEdgeLossDb(v2)).toBeGreaterThanOrEqual(knifeEdgeLossDb(v));
        },
      ),
    );
  });

  it("[PR5] the Fresnel zone is widest at mid-path for a given total length", () => {
    fc.assert(
      fc.property(
        frequencyHz,
        distanceM,
        fc.double({ min: 0.01, max: 0.49, noNaN: true }),
        (f, total, frac) => {
          const mid = fresnelZoneRadiusM({ frequencyHz: f, d1M: total / 2, d2M: total / 2 });
          const off = fresnelZoneRadiusM({ frequencyHz: f, d1M: total * frac, d2M: total * (1 - frac) });
          expect(off).toBeLessThan(mid);
        },
      ),
    );
  });
});

describe("Atmosphere and rain properties", () => {
  it("[AT4] two-way gas loss is proportional to range", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e9, max: 3.5e11, noNaN: true }), distanceM, factor, (f, r, m) => {
        const l = twoWayGasLossDb({ frequencyHz: f, rangeM: r });
        expect(l).toBeGreaterThan(0);
        expect(twoWayGasLossDb({ frequencyHz: f, rangeM: r * m }) / l).toBeCloseTo(m, 9);
        expect(gaseousAttenuationDbPerKm(f)).toBeGreaterThan(0);
      }),
    );
  });

  it("[AT9] rain attenuation grows with rain rate", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e9, max: 1e12, noNaN: true }),
        fc.double({ min: 0.01, max: 300, noNaN: true }),
        factor,
        (f, r, m) => {
          const g = rainAttenuationDbPerKm({ frequencyHz: f, rainRateMmPerH: r });
          expect(g).toBeGreaterThan(0);
          expect(rainAttenuationDbPerKm({ frequencyHz: f, rainRateMmPerH: r * m })).toBeGreaterThan(g);
        },
      ),
    );
  });
});

describe("RF exposure properties", () => {
  it("[RF3] the compliance distance scales as √EIRP and as 1/√limit, and meets the limit exactly", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 1e7, noNaN: true }),
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        fc.double({ min: 1.01, max: 1e4, noNaN: true }),
        (eirpAvgW, limitWPerM2, m) => {
          const r = complianceDistanceM({ eirpAvgW, limitWPerM2 });
          expect(complianceDistanceM({ eirpAvgW: eirpAvgW * m, limitWPerM2 }) / r).toBeCloseTo(
            Math.sqrt(m),
            9,
          );
          expect(complianceDistanceM({ eirpAvgW, limitWPerM2: limitWPerM2 * m }) * Math.sqrt(m)).toBeCloseTo(
            r,
            9,
          );
          expect(powerDensityWPerM2({ eirpW: eirpAvgW, distanceM: r }) / limitWPerM2).toBeCloseTo(1, 9);
        },
      ),
    );
  });
});
