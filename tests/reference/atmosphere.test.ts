import { describe, expect, it } from "vitest";
import {
  gaseousAttenuationDbPerKm,
  oxygenAttenuationDbPerKm,
  twoWayGasLossDb,
  waterVapourAttenuationDbPerKm,
} from "../../src/coverage/atmosphere.ts";
import validation from "../fixtures/propagation/p676-12-annex1-validation.json" with { type: "json" };

const GHZ = 1e9;

// The validation values are for a dry-air pressure of 1013.25 hPa plus the vapour partial pressure
// e = ρ·T/216.7 hPa (ITU-R P.676-12 eq. 4); the Annex 2 formulas take the total pressure.
const { dryPressureHpa, temperatureK, waterVapourDensityGPerM3 } = validation.conditions;
const vapourPressureHpa = (waterVapourDensityGPerM3 * temperatureK) / 216.7;
const CONDITIONS = {
  totalPressureHpa: dryPressureHpa + vapourPressureHpa,
  temperatureK,
  waterVapourDensityGPerM3,
};

function rowAt(fGhz: number) {
  const row = validation.rows.find((r) => r.frequencyGhz === fGhz);
  if (!row) throw new Error(`no validation row at ${fGhz} GHz`);
  return row;
}

describe("Atmosphere: gaseous attenuation (simplified ITU-R P.676-10 Annex 2 against P.676-12 Annex 1)", () => {
  it("[AT1] 10 GHz: about 0.014 dB/km in the standard atmosphere (ITU-R P.676-12 Annex 1 validation value 0.0142)", () => {
    const ref = rowAt(10);
    expect(ref.totalDbPerKm).toBeCloseTo(0.0142, 4);
    const g = gaseousAttenuationDbPerKm(10 * GHZ, CONDITIONS);
    // Annex 2 is a fit to an older line catalogue: below 40 GHz it is within 9 % (see [AT2]).
    expect(Math.abs(g / ref.totalDbPerKm - 1)).toBeLessThan(0.09);
    expect(Math.abs(oxygenAttenuationDbPerKm(10 * GHZ, CONDITIONS) - ref.oxygenDbPerKm)).toBeLessThan(0.0005);
    expect(
      Math.abs(waterVapourAttenuationDbPerKm(10 * GHZ, CONDITIONS) - ref.waterVapourDbPerKm),
    ).toBeLessThan(0.001);
  });

  it("[AT1] 24 GHz, near the 22.235 GHz water-vapour line: about 0.17 dB/km (P.676-12 Annex 1 validation value 0.1732)", () => {
    const ref = rowAt(24);
    expect(ref.totalDbPerKm).toBeCloseTo(0.1732, 4);
    const g = gaseousAttenuationDbPerKm(24 * GHZ, CONDITIONS);
    expect(Math.abs(g / ref.totalDbPerKm - 1)).toBeLessThan(0.09);
    // The water-vapour line peaks near 22–23 GHz in both models (P.676 Figure 1 shape).
    const at22 = waterVapourAttenuationDbPerKm(22.235 * GHZ, CONDITIONS);
    expect(at22).toBeGreaterThan(waterVapourAttenuationDbPerKm(18 * GHZ, CONDITIONS));
    expect(at22).toBeGreaterThan(waterVapourAttenuationDbPerKm(28 * GHZ, CONDITIONS));
  });

  it("[AT1] 60 GHz oxygen complex: about 15 dB/km (P.676-12 Annex 1 validation value 14.78)", () => {
    const ref = rowAt(60);
    const g = gaseousAttenuationDbPerKm(60 * GHZ, CONDITIONS);
    expect(Math.abs(g / ref.totalDbPerKm - 1)).toBeLessThan(0.11);
  });

  it.each([
    // [from GHz, to GHz, relative bound, absolute bound dB/km]: the measured worst cases are 8.6 % and
    // 0.0105 dB/km (1–40), 10.9 % (40–100, at 53 GHz on the steep oxygen skirt), 12.1 % (100–350).
    [1, 40, 0.09, 0.011],
    [40, 100, 0.11, 1.1],
    [100, 350, 0.125, 1.0],
  ])(
    "[AT2] from %d to %d GHz the simplified model is within %s (relative) of P.676-12 Annex 1 (stated error)",
    (lo, hi, rel, abs) => {
      const rows = validation.rows.filter((r) => r.frequencyGhz >= lo && r.frequencyGhz <= hi);
      expect(rows.length).toBeGreaterThan(10);
      for (const r of rows) {
        const g = gaseousAttenuationDbPerKm(r.frequencyGhz * GHZ, CONDITIONS);
        expect(Math.abs(g / r.totalDbPerKm - 1), `${r.frequencyGhz} GHz`).toBeLessThan(rel);
        expect(Math.abs(g - r.totalDbPerKm), `${r.frequencyGhz} GHz`).toBeLessThan(abs);
      }
    },
  );

  it("[AT3] dry air has no water-vapour attenuation; more vapour means more loss", () => {
    expect(waterVapourAttenuationDbPerKm(24 * GHZ, { waterVapourDensityGPerM3: 0 })).toBe(0);
    const wet = gaseousAttenuationDbPerKm(24 * GHZ, { waterVapourDensityGPerM3: 15 });
    const std = gaseousAttenuationDbPerKm(24 * GHZ);
    expect(wet).toBeGreaterThan(std);
  });

  it("[AT4] two-way loss is 2·γ·r: 0.28 dB over 10 km at 10 GHz (2 × 10 km × the P.676-12 Annex 1 value 0.0142 dB/km)", () => {
    // The outside value is derived, not quoted: the ITU-R P.676-12 Annex 1 validation value at 10 GHz in
    // the standard atmosphere (0.0142 dB/km, the same fixture row as [AT1]) times the two-way path length
    // 2 × 10 km gives 0.284 dB (A = γ·r on a terrestrial path, P.676-12 Annex 1 §2.1, equation number
    // not checked). The loss is evaluated in the fixture's conditions (CONDITIONS, as in [AT1]).
    const ref = rowAt(10);
    const referenceTwoWayDb = 2 * 10 * ref.totalDbPerKm;
    expect(referenceTwoWayDb).toBeCloseTo(0.284, 3);
    const loss = twoWayGasLossDb({ frequencyHz: 10 * GHZ, rangeM: 10_000, atmosphere: CONDITIONS });
    // The loss is exactly 2·γ·r of the model's own γ (to rounding) ...
    expect(loss).toBeCloseTo(20 * gaseousAttenuationDbPerKm(10 * GHZ, CONDITIONS), 12);
    // ... and γ is the simplified Annex 2 fit, within 9 % of Annex 1 below 40 GHz ([AT2]); a ratio is
    // unchanged by the factor 2·r, so the same 9 % bounds the two-way loss against 0.284 dB.
    expect(Math.abs(loss / referenceTwoWayDb - 1)).toBeLessThan(0.09);
    // The default (standard sea-level) conditions differ from CONDITIONS only by the ≈10 hPa vapour
    // pressure in the total pressure; the loss there holds the same 9 % bound (checked here, not derived).
    const lossDefault = twoWayGasLossDb({ frequencyHz: 10 * GHZ, rangeM: 10_000 });
    expect(Math.abs(lossDefault / referenceTwoWayDb - 1)).toBeLessThan(0.09);
    expect(twoWayGasLossDb({ frequencyHz: 10 * GHZ, rangeM: 0 })).toBe(0);
  });

  it("[AT5] outside 1–350 GHz, for a negative range or impossible conditions the result is NaN", () => {
    expect(gaseousAttenuationDbPerKm(0.5 * GHZ)).toBeNaN();
    expect(gaseousAttenuationDbPerKm(400 * GHZ)).toBeNaN();
    expect(gaseousAttenuationDbPerKm(Number.NaN)).toBeNaN();
    expect(gaseousAttenuationDbPerKm(10 * GHZ, { totalPressureHpa: 0 })).toBeNaN();
    expect(gaseousAttenuationDbPerKm(10 * GHZ, { temperatureK: -3 })).toBeNaN();
    expect(gaseousAttenuationDbPerKm(10 * GHZ, { waterVapourDensityGPerM3: -1 })).toBeNaN();
    expect(twoWayGasLossDb({ frequencyHz: 10 * GHZ, rangeM: -1 })).toBeNaN();
  });

  it("[AT2] the fixture is the transcribed ITU-R validation table: its columns add up (transcription check)", () => {
    for (const r of validation.rows) {
      expect(Math.abs(r.oxygenDbPerKm + r.waterVapourDbPerKm - r.totalDbPerKm)).toBeLessThan(
        2e-8 * Math.max(1, r.totalDbPerKm),
      );
    }
  });
});
