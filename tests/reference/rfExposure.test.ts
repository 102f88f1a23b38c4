import { describe, expect, it } from "vitest";
import type { AntennaSpec, RadarModel } from "../../src/coverage/radarModel.ts";
import {
  complianceDistanceM,
  complianceTable,
  exposureLimits,
  farFieldDistanceM,
  powerDensityWPerM2,
  RF_SAFETY_CAUTIONS,
  radarExposure,
  timeAveragedEirpW,
} from "../../src/coverage/rfExposure.ts";
import { dbToLinear } from "../../src/coverage/units.ts";

const GHZ = 1e9;
const MHZ = 1e6;

describe("RF exposure: reference levels", () => {
  // ICNIRP (2020) whole-body reference levels, incident power density averaged over 30 min (values
  // from memory): >30–400 MHz 2 / 10 W/m², >400–2000 MHz f/200 / f/40, >2–300 GHz 10 / 50 W/m²
  // (general public / occupational). 47 CFR §1.1310(e)(1) Table 1 in mW/cm² (from memory):
  // general population 0.2 (30–300 MHz), f/1500 (300–1500 MHz), 1.0 (1.5–100 GHz), 180/f² (1.34–30 MHz);
  // occupational 1.0, f/300, 5, 900/f² (3–30 MHz). 1 mW/cm² = 10 W/m² exactly. The levels are exact
  // numbers, so the tolerance is floating-point rounding only.
  it.each([
    // [f Hz, ICNIRP public, ICNIRP occupational, FCC public, FCC occupational] in W/m²
    [10 * GHZ, 10, 50, 10, 50],
    [24.125 * GHZ, 10, 50, 10, 50],
    [77 * GHZ, 10, 50, 10, 50],
    [5.8 * GHZ, 10, 50, 10, 50],
    [2 * GHZ, 10, 50, 10, 50],
    [1.5 * GHZ, 7.5, 37.5, 10, 50],
    [900 * MHZ, 4.5, 22.5, 6, 30],
    [400 * MHZ, 2, 10, (400 / 1500) * 10, (400 / 300) * 10],
    [100 * MHZ, 2, 10, 2, 10],
    [20 * MHZ, Number.NaN, Number.NaN, (180 / 400) * 10, (900 / 400) * 10],
    [150 * GHZ, 10, 50, Number.NaN, Number.NaN],
  ])("[RF1] %s Hz: ICNIRP %s / %s W/m², FCC %s / %s W/m² (public / occupational)", (f, ip, io, fp, fo) => {
    const l = exposureLimits(f);
    const check = (got: number, want: number) =>
      Number.isNaN(want) ? expect(got).toBeNaN() : expect(got).toBeCloseTo(want, 12);
    check(l.icnirp.publicWPerM2, ip);
    check(l.icnirp.occupationalWPerM2, io);
    check(l.fcc.publicWPerM2, fp);
    check(l.fcc.occupationalWPerM2, fo);
  });

  it("[RF1] averaging times: ICNIRP 30 min; FCC 30 min general population, 6 min occupational (47 CFR §1.1310 Table 1)", () => {
    const l = exposureLimits(10 * GHZ);
    expect(l.icnirp.publicAveragingTimeS).toBe(1800);
    expect(l.icnirp.occupationalAveragingTimeS).toBe(1800);
    expect(l.fcc.publicAveragingTimeS).toBe(1800);
    expect(l.fcc.occupationalAveragingTimeS).toBe(360);
  });

  it("[RF1] the levels are continuous across band edges and NaN outside the tables", () => {
    for (const edgeMhz of [400, 2000]) {
      const lo = exposureLimits(edgeMhz * MHZ * (1 - 1e-9)).icnirp;
      const hi = exposureLimits(edgeMhz * MHZ * (1 + 1e-9)).icnirp;
      expect(hi.publicWPerM2).toBeCloseTo(lo.publicWPerM2, 5);
      expect(hi.occupationalWPerM2).toBeCloseTo(lo.occupationalWPerM2, 5);
    }
    for (const edgeMhz of [3, 30, 300, 1500]) {
      const lo = exposureLimits(edgeMhz * MHZ * (1 - 1e-9)).fcc;
      const hi = exposureLimits(edgeMhz * MHZ * (1 + 1e-9)).fcc;
      expect(hi.occupationalWPerM2).toBeCloseTo(lo.occupationalWPerM2, 5);
    }
    for (const edgeMhz of [30, 300, 1500]) {
      const lo = exposureLimits(edgeMhz * MHZ * (1 - 1e-9)).fcc;
      const hi = exposureLimits(edgeMhz * MHZ * (1 + 1e-9)).fcc;
      expect(hi.publicWPerM2).toBeCloseTo(lo.publicWPerM2, 5);
    }
    expect(exposureLimits(0).fcc.publicWPerM2).toBeNaN();
    expect(exposureLimits(-1).icnirp.publicWPerM2).toBeNaN();
    expect(exposureLimits(Number.NaN).icnirp.occupationalWPerM2).toBeNaN();
    expect(exposureLimits(400 * GHZ).icnirp.publicWPerM2).toBeNaN();
  });
});

describe("RF exposure: power density and compliance distance", () => {
  it("[RF2] S = EIRP/(4πr²): 100 W EIRP gives 7.96 W/m² at 1 m and 1/100 of that at 10 m (FCC OET Bulletin 65 §2, common practice)", () => {
    expect(powerDensityWPerM2({ eirpW: 100, distanceM: 1 })).toBeCloseTo(100 / (4 * Math.PI), 12);
    expect(powerDensityWPerM2({ eirpW: 100, distanceM: 1 })).toBeCloseTo(7.958, 3);
    expect(powerDensityWPerM2({ eirpW: 100, distanceM: 10 })).toBeCloseTo(0.07958, 5);
    expect(powerDensityWPerM2({ eirpW: 100, distanceM: 0 })).toBeNaN();
    expect(powerDensityWPerM2({ eirpW: -1, distanceM: 3 })).toBeNaN();
  });

  it("[RF3] worked example (hand calculation): 25 W peak, 30 dBi, 1 % duty, staring → 250 W average EIRP; 1.41 m public, 0.63 m occupational at 10 GHz", () => {
    // Invented X-band example. EIRP_peak = 25 W · 10^(30/10) = 25 kW; duty 1 µs · 10 kHz = 0.01.
    const peakEirpW = 25 * dbToLinear(30);
    const eirpAvgW = timeAveragedEirpW({ peakEirpW, dutyCycle: 1e-6 * 10e3 });
    expect(eirpAvgW).toBeCloseTo(250, 9);
    // r = √(250 / (4π · 10)) = √1.98944 = 1.4105 m;  √(250 / (4π · 50)) = √0.397887 = 0.63078 m.
    const rows = complianceTable({ frequencyHz: 10 * GHZ, eirpAvgW });
    expect(rows.map((r) => [r.standard, r.population])).toEqual([
      ["ICNIRP 2020", "general public"],
      ["ICNIRP 2020", "occupational"],
      ["FCC 47 CFR 1.1310", "general public"],
      ["FCC 47 CFR 1.1310", "occupational"],
    ]);
    expect(rows[0].distanceM).toBeCloseTo(1.4105, 4);
    expect(rows[1].distanceM).toBeCloseTo(0.63078, 4);
    expect(rows[2].distanceM).toBeCloseTo(1.4105, 4);
    expect(rows[3].distanceM).toBeCloseTo(0.63078, 4);
    // At the compliance distance the density equals the limit.
    expect(powerDensityWPerM2({ eirpW: eirpAvgW, distanceM: rows[0].distanceM })).toBeCloseTo(10, 9);
    // A rotating antenna with a 2° beam spends 2/360 of the time on a point: distance shrinks by √(2/360).
    const rotating = timeAveragedEirpW({ peakEirpW, dutyCycle: 0.01, scanFraction: 2 / 360 });
    expect(complianceDistanceM({ eirpAvgW: rotating, limitWPerM2: 10 })).toBeCloseTo(
      1.4105 * Math.sqrt(2 / 360),
      4,
    );
  });

  it("[RF3] worked example: a 24 GHz FMCW sensor with 1 W EIRP, continuous, needs 8.9 cm for the public limit", () => {
    // r = √(1 / (4π · 10)) = 0.0892 m (hand calculation).
    expect(complianceDistanceM({ eirpAvgW: 1, limitWPerM2: 10 })).toBeCloseTo(0.0892, 4);
  });

  it("[RF3] the OET 65 ground-reflection factor 2.56 (field 1.6²) lengthens the distance by 1.6 (from memory)", () => {
    const r1 = complianceDistanceM({ eirpAvgW: 250, limitWPerM2: 10 });
    const r2 = complianceDistanceM({ eirpAvgW: 250, limitWPerM2: 10, powerReflectionFactor: 2.56 });
    expect(r2 / r1).toBeCloseTo(1.6, 12);
    expect(complianceDistanceM({ eirpAvgW: 250, limitWPerM2: 10, powerReflectionFactor: 0.5 })).toBeNaN();
    expect(complianceDistanceM({ eirpAvgW: 0, limitWPerM2: 10 })).toBe(0);
    expect(complianceDistanceM({ eirpAvgW: 10, limitWPerM2: 0 })).toBeNaN();
    expect(complianceDistanceM({ eirpAvgW: 10, limitWPerM2: Number.NaN })).toBeNaN();
  });

  it("[RF3] compliance rows are NaN where a standard has no level (FCC above 100 GHz)", () => {
    const rows = complianceTable({ frequencyHz: 140 * GHZ, eirpAvgW: 5 });
    expect(rows[0].distanceM).toBeGreaterThan(0);
    expect(rows[2].distanceM).toBeNaN();
    expect(rows[3].limitWPerM2).toBeNaN();
  });

  it("[RF4] duty cycle and scan fraction must lie in [0, 1]", () => {
    expect(timeAveragedEirpW({ peakEirpW: 100, dutyCycle: 1.2 })).toBeNaN();
    expect(timeAveragedEirpW({ peakEirpW: 100, dutyCycle: -0.1 })).toBeNaN();
    expect(timeAveragedEirpW({ peakEirpW: 100, dutyCycle: 0.5, scanFraction: 2 })).toBeNaN();
    expect(timeAveragedEirpW({ peakEirpW: -5, dutyCycle: 0.5 })).toBeNaN();
    expect(timeAveragedEirpW({ peakEirpW: 100, dutyCycle: 1 })).toBe(100);
  });

  it("[RF5] far-field distance 2D²/λ: a 0.3 m aperture at 10 GHz has its far field beyond 6.0 m (IEEE Std 145, common practice)", () => {
    expect(farFieldDistanceM({ apertureM: 0.3, frequencyHz: 10 * GHZ })).toBeCloseTo(
      (2 * 0.09) / 0.0299792458,
      9,
    );
    expect(farFieldDistanceM({ apertureM: 0.3, frequencyHz: 10 * GHZ })).toBeCloseTo(6.0, 1);
    expect(farFieldDistanceM({ apertureM: 0, frequencyHz: 10 * GHZ })).toBeNaN();
  });

  it("[RF6] the cautions cover the near field, local rules and licensed practice, spectrum authorisation, and work at height", () => {
    const text = RF_SAFETY_CAUTIONS.join(" ").toLowerCase();
    expect(RF_SAFETY_CAUTIONS.length).toBeGreaterThanOrEqual(4);
    for (const must of [
      "near-field",
      "local regulations",
      "licensed",
      "spectrum authorisation",
      "work at height",
      "stopped",
    ]) {
      expect(text).toContain(must);
    }
  });

  it("[RF4] a radar model's exposure (invented rotating X-band radar, hand calculation): 25 kW peak EIRP, 1 % duty, 2°/360° dwell", () => {
    const antenna: AntennaSpec = {
      peakGainDbi: 30,
      azBeamwidthDeg: 2,
      elBeamwidthDeg: 20,
      sidelobeFloorDb: -30,
      mainBeam: "gaussian",
    };
    const radar: RadarModel = {
      id: "invented-x",
      name: "Invented rotating X-band",
      invented: true,
      frequencyHz: 9.4 * GHZ,
      transmitter: { peakPowerW: 25 },
      receiver: { noiseFigureDb: 3, systemLossDb: 4 },
      waveform: { kind: "pulsed", pulseWidthS: 1e-6, prfHz: 10e3, pulsesIntegrated: 16 },
      txAntenna: antenna,
      scan: { kind: "rotating", fovElDeg: 20 },
      updateIntervalS: 2,
      blindZoneM: 150,
      maxInstrumentedRangeM: 12_000,
    };
    const e = radarExposure(radar);
    expect(e.peakEirpW).toBeCloseTo(25_000, 6);
    expect(e.dutyCycle).toBeCloseTo(0.01, 12);
    expect(e.scanFraction).toBeCloseTo(2 / 360, 12);
    expect(e.averageEirpStoppedW).toBeCloseTo(250, 6);
    expect(e.stopped[0].distanceM).toBeCloseTo(1.4105, 4);
    expect(e.scanning[0].distanceM).toBeCloseTo(1.4105 * Math.sqrt(2 / 360), 4);
    // An FMCW radar ramping 80 µs of every 100 µs, staring: duty 0.8, no scan reduction.
    const fmcw = radarExposure({
      ...radar,
      frequencyHz: 24.125 * GHZ,
      transmitter: { peakPowerW: 0.1 },
      waveform: {
        kind: "fmcw",
        chirpBandwidthHz: 250e6,
        chirpDurationS: 80e-6,
        chirpPeriodS: 100e-6,
        chirpsPerFrame: 128,
        ifSampleRateHz: 10e6,
        ifSampling: "complex",
      },
      txAntenna: { ...antenna, peakGainDbi: 20, azBeamwidthDeg: 15 },
      scan: { kind: "staring", fovAzDeg: 90, fovElDeg: 20 },
    });
    expect(fmcw.dutyCycle).toBeCloseTo(0.8, 12);
    expect(fmcw.scanFraction).toBe(1);
    expect(fmcw.averageEirpScanningW).toBeCloseTo(8, 9);
    // r = √(8 / (4π · 10)) = 0.2523 m.
    expect(fmcw.stopped[0].distanceM).toBeCloseTo(0.2523, 4);
  });
});
