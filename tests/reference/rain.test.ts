import { describe, expect, it } from "vitest";
import { rainAttenuationDbPerKm, rainCoefficients, twoWayRainLossDb } from "../../src/coverage/rain.ts";

const GHZ = 1e9;

describe("Rain: ITU-R P.838-3 coefficients and specific attenuation", () => {
  // ITU-R P.838-3 Table 5 (coefficients tabulated by frequency; values from memory). The regression
  // formulas reproduce the table to its printed precision (4–5 significant digits): tolerance half a
  // unit in the last printed digit, widened to 1e-4 relative for k.
  it.each([
    [1, 0.0000259, 0.9691, 0.0000308, 0.8592],
    [10, 0.01217, 1.2571, 0.01129, 1.2156],
    [20, 0.09164, 1.0568, 0.09611, 0.9847],
    [30, 0.2403, 0.9485, 0.2291, 0.9129],
  ])(
    "[AT6] %d GHz: k_H = %s, α_H = %s, k_V = %s, α_V = %s (ITU-R P.838-3 Table 5, from memory)",
    (fGhz, kH, aH, kV, aV) => {
      const c = rainCoefficients(fGhz * GHZ);
      expect(Math.abs(c.kH / kH - 1)).toBeLessThan(2e-3);
      expect(Math.abs(c.kV / kV - 1)).toBeLessThan(2e-3);
      expect(Math.abs(c.alphaH - aH)).toBeLessThan(6e-5);
      expect(Math.abs(c.alphaV - aV)).toBeLessThan(6e-5);
    },
  );

  // ITU-R Study Group 3 validation examples for P.838-3 (as tabulated in the open ITU-Rpy project's test
  // data, test/test_data/838/ITURP838-3_rain_specific_attenuation.csv): elevation θ, frequency, rain
  // rate, tilt τ, and the resulting k, α, γ_R. Printed to 8–9 significant digits: tolerance 1e-7 relative.
  it.each([
    [31.07699124, 14.25, 26.48052, 0, 0.03975488, 1.12418043, 1.58130839],
    [52.67898486, 14.25, 78.2994993, 0, 0.04053522, 1.10944215, 5.11503463],
    [85.80459566, 14.25, 99.13558978, 90, 0.04133039, 1.09499629, 6.34064598],
    [20.14335809, 14.25, 42.91007183, 90, 0.04319835, 1.0631531, 2.35032323],
    [22.27833468, 29, 50.639304, 0, 0.22168203, 0.95543001, 9.42430244],
    [40.232036, 29, 33.936232, 0, 0.22031404, 0.9504446, 6.27846024],
    [48.24117054, 29, 63.62668149, 90, 0.21517927, 0.93116621, 10.28699163],
  ])(
    "[AT7] θ = %s°, %s GHz, R = %s mm/h, τ = %s°: k, α and γ_R match the ITU-R P.838-3 validation example",
    (elevationDeg, fGhz, rainRateMmPerH, polarisationTiltDeg, k, alpha, gamma) => {
      const geom = { elevationDeg, polarisationTiltDeg };
      const c = rainCoefficients(fGhz * GHZ, geom);
      expect(Math.abs(c.k / k - 1)).toBeLessThan(1e-7);
      expect(Math.abs(c.alpha / alpha - 1)).toBeLessThan(1e-7);
      const g = rainAttenuationDbPerKm({ frequencyHz: fGhz * GHZ, rainRateMmPerH, ...geom });
      expect(Math.abs(g / gamma - 1)).toBeLessThan(1e-7);
    },
  );

  it("[AT6] 10 GHz, 25 mm/h, horizontal: γ_R = k·R^α = 0.0122·25^1.257 ≈ 0.69 dB/km (ITU-R P.838-3 eq. 1 with Table 5 values)", () => {
    const g = rainAttenuationDbPerKm({ frequencyHz: 10 * GHZ, rainRateMmPerH: 25 });
    expect(Math.abs(g / (0.01217 * 25 ** 1.2571) - 1)).toBeLessThan(2e-3);
    expect(g).toBeGreaterThan(0.68);
    expect(g).toBeLessThan(0.7);
  });

  it("[AT8] polarisation combination (eqs. 4–5): τ = 0 at θ = 0 gives the H values, τ = 90° the V values, τ = 45° the mean k", () => {
    const f = 24 * GHZ;
    const h = rainCoefficients(f, { polarisationTiltDeg: 0, elevationDeg: 0 });
    const v = rainCoefficients(f, { polarisationTiltDeg: 90, elevationDeg: 0 });
    const c = rainCoefficients(f, { polarisationTiltDeg: 45, elevationDeg: 0 });
    expect(h.k).toBeCloseTo(h.kH, 14);
    expect(h.alpha).toBeCloseTo(h.alphaH, 14);
    expect(v.k).toBeCloseTo(v.kV, 14);
    expect(v.alpha).toBeCloseTo(v.alphaV, 14);
    expect(c.k).toBeCloseTo((c.kH + c.kV) / 2, 14);
    expect(c.alpha).toBeCloseTo((c.kH * c.alphaH + c.kV * c.alphaV) / (c.kH + c.kV), 14);
    // At zenith (θ = 90°) polarisation no longer matters.
    const z0 = rainCoefficients(f, { polarisationTiltDeg: 0, elevationDeg: 90 });
    const z90 = rainCoefficients(f, { polarisationTiltDeg: 90, elevationDeg: 90 });
    expect(z0.k).toBeCloseTo(z90.k, 12);
  });

  it("[AT9] two-way rain loss is 2·γ·min(range, rain extent); 0 without rain; NaN outside the domain", () => {
    const p = { frequencyHz: 9.4 * GHZ, rainRateMmPerH: 10, rangeM: 8000 };
    const g = rainAttenuationDbPerKm(p);
    expect(twoWayRainLossDb(p)).toBeCloseTo(16 * g, 12);
    expect(twoWayRainLossDb({ ...p, rainExtentM: 2000 })).toBeCloseTo(4 * g, 12);
    expect(twoWayRainLossDb({ ...p, rainRateMmPerH: 0 })).toBe(0);
    expect(rainAttenuationDbPerKm({ ...p, rainRateMmPerH: -1 })).toBeNaN();
    expect(rainAttenuationDbPerKm({ ...p, frequencyHz: 0.5 * GHZ })).toBeNaN();
    expect(rainAttenuationDbPerKm({ ...p, frequencyHz: 0.5 * GHZ, rainRateMmPerH: 0 })).toBeNaN();
    expect(rainCoefficients(2000 * GHZ).k).toBeNaN();
    expect(rainCoefficients(10 * GHZ, { elevationDeg: Number.NaN }).alpha).toBeNaN();
    expect(twoWayRainLossDb({ ...p, rangeM: -1 })).toBeNaN();
  });
});
