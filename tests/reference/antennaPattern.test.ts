/**
 * Reference checks of the antenna patterns, scan modes and gain estimates against sources outside the
 * project. Each case names its source beside it.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  directivityFromBeamwidthsDbi,
  patchArrayGainDbi,
  practicalGainFromBeamwidthsDbi,
} from "../../src/coverage/antennaGain.ts";
import {
  cutRelativeDb,
  gainDbi,
  mainBeamRelativeDb,
  makeRelativeGain,
  makeTwoWayRelativeGain,
  receiveAntenna,
  relativeGainDb,
  scanGeometry,
  towardsTarget,
} from "../../src/coverage/antennaPattern.ts";
import { SINC2_HALF_POWER_ARGUMENT } from "../../src/coverage/constants.ts";
import type { AntennaSpec, MainBeamShape } from "../../src/coverage/radarModel.ts";
import { dbToLinear, linearToDb } from "../../src/coverage/units.ts";

const fixture = JSON.parse(
  readFileSync(new URL("../fixtures/antennaPattern/beams.json", import.meta.url), "utf8"),
) as {
  sinc2HalfPowerArgument: number;
  uniformFirstNullOverBeamwidth: number;
  rows: { shape: MainBeamShape; beamwidthDeg: number; offDeg: number; relativeDb: number | null }[];
};

const HALF_POWER_DB = -linearToDb(2);

describe("[AP1] main-beam shapes", () => {
  it("[AP1] half-power (−3.01 dB) points at exactly ± half the beamwidth, both shapes (IEEE Std 145 definition)", () => {
    for (const shape of ["gaussian", "sinc2"] as const) {
      for (const bw of [0.5, 3, 12, 45, 120]) {
        // Exact by construction up to rounding of one exp/sin: 1e-12 dB.
        expect(Math.abs(mainBeamRelativeDb(shape, bw / 2, bw) - HALF_POWER_DB)).toBeLessThan(1e-12);
        expect(Math.abs(mainBeamRelativeDb(shape, -bw / 2, bw) - HALF_POWER_DB)).toBeLessThan(1e-12);
        expect(mainBeamRelativeDb(shape, 0, bw)).toBe(0);
      }
    }
  });

  it("[AP1] sinc² half-power argument 1.39156 agrees with scipy brentq (fixture)", () => {
    // Two root finders on the same equation: agreement to a few ulp.
    expect(Math.abs(SINC2_HALF_POWER_ARGUMENT - fixture.sinc2HalfPowerArgument)).toBeLessThan(1e-14);
    const s = Math.sin(SINC2_HALF_POWER_ARGUMENT) / SINC2_HALF_POWER_ARGUMENT;
    expect(Math.abs(s * s - 0.5)).toBeLessThan(1e-15);
  });

  it("[AP1] uniform aperture: first null at λ/D when the beamwidth is 0.886 λ/D (Skolnik, 3rd ed., ch. 9, common practice)", () => {
    // Null / beamwidth = 1/0.886 = 1.1287 (the handbook's 0.886 is rounded to 3 digits: ±6e-4).
    expect(Math.abs(fixture.uniformFirstNullOverBeamwidth - 1 / 0.886)).toBeLessThan(1e-3);
    const bw = 10;
    const nullDeg = fixture.uniformFirstNullOverBeamwidth * bw;
    expect(mainBeamRelativeDb("sinc2", nullDeg * (1 - 1e-9), bw)).toBeGreaterThan(-200);
    expect(mainBeamRelativeDb("sinc2", nullDeg * (1 + 1e-9), bw)).toBe(Number.NEGATIVE_INFINITY);
  });

  it("[AP1] Gaussian beam is 12.04 dB down at one full beamwidth off axis (common practice: 4 × 3.01 dB)", () => {
    expect(Math.abs(mainBeamRelativeDb("gaussian", 7, 7) - 4 * HALF_POWER_DB)).toBeLessThan(1e-12);
  });

  it("[AP1] both shapes agree with the independent numpy implementation (fixture)", () => {
    for (const r of fixture.rows) {
      const v = mainBeamRelativeDb(r.shape, r.offDeg, r.beamwidthDeg);
      if (r.relativeDb === null) expect(v).toBe(Number.NEGATIVE_INFINITY);
      // exp/sin/log10 in two libraries: 1e-9 dB.
      else expect(Math.abs(v - r.relativeDb), `${r.shape} ${r.beamwidthDeg} ${r.offDeg}`).toBeLessThan(1e-9);
    }
  });
});

const pencil: AntennaSpec = {
  peakGainDbi: 30,
  azBeamwidthDeg: 4,
  elBeamwidthDeg: 10,
  sidelobeFloorDb: -28,
  mainBeam: "gaussian",
};

describe("[AP3] sidelobe floor and combined pattern", () => {
  it("[AP3] az and el factors add in dB and the floor bounds the result", () => {
    // −3.01 dB in az at 2°, −3.01 dB in el at 5°: −6.02 dB together (separable pattern).
    expect(Math.abs(relativeGainDb(pencil, 2, 5) - 2 * HALF_POWER_DB)).toBeLessThan(1e-12);
    expect(relativeGainDb(pencil, 90, 0)).toBe(-28);
    expect(gainDbi(pencil, 180, 40)).toBe(2);
    // Azimuth offsets wrap: 358° off is 2° off.
    expect(relativeGainDb(pencil, 358, 0)).toBeCloseTo(relativeGainDb(pencil, -2, 0), 12);
  });
});

describe("[AP6] measured pattern cuts", () => {
  const cut = { angleDeg: [-20, -5, 0, 5, 10, 30], relativeGainDb: [-30, -6, 0, -3, -12, -25] };
  const measured: AntennaSpec = { ...pencil, azCut: cut, sidelobeFloorDb: -20 };

  it("[AP6] interpolated linearly in dB between samples (hand values)", () => {
    expect(cutRelativeDb(cut, 2.5)).toBeCloseTo(-1.5, 12);
    expect(cutRelativeDb(cut, 7.5)).toBeCloseTo(-7.5, 12);
    expect(cutRelativeDb(cut, -12.5)).toBeCloseTo(-18, 12);
    expect(cutRelativeDb(cut, 30)).toBe(-25);
    expect(cutRelativeDb(cut, -20)).toBe(-30);
    expect(cutRelativeDb(cut, 0)).toBe(0);
    // Asymmetric cuts stay asymmetric: +5° and −5° differ.
    expect(relativeGainDb(measured, 5, 0)).toBeCloseTo(-3, 12);
    expect(relativeGainDb(measured, -5, 0)).toBeCloseTo(-6, 12);
  });

  it("[AP6] clamped at the floor, and at the floor outside the measured span", () => {
    expect(relativeGainDb(measured, -20, 0)).toBe(-20);
    expect(relativeGainDb(measured, 25, 0)).toBe(-20);
    expect(relativeGainDb(measured, 60, 0)).toBe(-20);
    expect(relativeGainDb(measured, -170, 0)).toBe(-20);
    expect(cutRelativeDb({ angleDeg: [], relativeGainDb: [] }, 0)).toBeNaN();
  });

  it("[AP6] an elevation cut replaces the analytic elevation shape", () => {
    const withEl: AntennaSpec = {
      ...pencil,
      elCut: { angleDeg: [-10, 0, 10], relativeGainDb: [-10, 0, -4] },
    };
    expect(relativeGainDb(withEl, 0, 5)).toBeCloseTo(-2, 12);
    expect(relativeGainDb(withEl, 0, -5)).toBeCloseTo(-5, 12);
  });
});

describe("[AP5] scan modes, boresight and tilt", () => {
  const mount = { antenna: pencil, boresightAzDeg: 350, tiltDeg: 2 };

  it("[AP5] staring: the pattern around boresight; no detection outside the azimuth FOV", () => {
    const staring = {
      ...mount,
      boresightAzDeg: 358.5,
      scan: { kind: "staring", fovAzDeg: 60, fovElDeg: 30 } as const,
    };
    // Boresight 358.5°, target at 0° (north): 1.5° clockwise of boresight, across the wrap; el 2° = tilt.
    const t = towardsTarget(staring, 0, 2);
    expect(t.inSector).toBe(true);
    expect(t.gainDbi).toBeCloseTo(30 + mainBeamRelativeDb("gaussian", 1.5, 4), 12);
    expect(t.gainDbi).toBeLessThan(30);
    expect(towardsTarget(staring, 357, 2).gainDbi).toBeCloseTo(t.gainDbi, 12);
    // Within the FOV but far off the beam: the floor (30 − 28 dBi).
    expect(towardsTarget(staring, 20, 2).gainDbi).toBe(2);
    const outside = towardsTarget(staring, 30, 2);
    expect(outside.inSector).toBe(false);
    expect(outside.instrumented).toBe(false);
    expect(outside.gainDbi).toBe(Number.NEGATIVE_INFINITY);
    expect(makeRelativeGain(staring)(30, 2)).toBe(0);
  });

  it("[AP5] sector: peak azimuth gain inside the sector, the pattern's roll-off beyond its edges", () => {
    const sector = { ...mount, scan: { kind: "sector", sectorWidthDeg: 90, fovElDeg: 30 } as const };
    expect(towardsTarget(sector, 350, 2).gainDbi).toBe(30);
    expect(towardsTarget(sector, 30, 2).gainDbi).toBe(30);
    expect(towardsTarget(sector, 35, 2).gainDbi).toBe(30);
    // 2° beyond the edge at 35°: the −3.01 dB point of a 4° beam.
    const beyond = towardsTarget(sector, 37, 2);
    expect(beyond.inSector).toBe(false);
    expect(beyond.instrumented).toBe(true);
    expect(Math.abs(beyond.gainDbi - (30 + HALF_POWER_DB))).toBeLessThan(1e-12);
    expect(Math.abs(towardsTarget(sector, 303, 2).gainDbi - (30 + HALF_POWER_DB))).toBeLessThan(1e-12);
    expect(towardsTarget(sector, 170, 2).gainDbi).toBe(2);
    expect(scanGeometry(sector, 37, 2).patternAzOffDeg).toBeCloseTo(2, 12);
  });

  it("[AP5] rotating: peak azimuth gain on every bearing; elevation by the pattern relative to tilt", () => {
    const rotating = { ...mount, scan: { kind: "rotating", fovElDeg: 40 } as const };
    for (const az of [0, 90, 170, 350, 359.9]) {
      expect(towardsTarget(rotating, az, 2).gainDbi).toBe(30);
      // 5° above a 2° tilt with a 10° elevation beam: −3.01 dB; positive tilt is up.
      expect(Math.abs(towardsTarget(rotating, az, 7).gainDbi - (30 + HALF_POWER_DB))).toBeLessThan(1e-12);
      expect(Math.abs(towardsTarget(rotating, az, -3).gainDbi - (30 + HALF_POWER_DB))).toBeLessThan(1e-12);
    }
    // Outside the elevation FOV (|el − tilt| > 20°) no mode detects.
    expect(towardsTarget(rotating, 0, 23).gainDbi).toBe(Number.NEGATIVE_INFINITY);
    expect(towardsTarget(rotating, 0, 21.9).instrumented).toBe(true);
  });
});

describe("[AP7] transmit and receive patterns", () => {
  const tx: AntennaSpec = {
    peakGainDbi: 16,
    azBeamwidthDeg: 25,
    elBeamwidthDeg: 25,
    sidelobeFloorDb: -25,
    mainBeam: "sinc2",
  };
  const rx: AntennaSpec = {
    peakGainDbi: 10.6,
    azBeamwidthDeg: 50,
    elBeamwidthDeg: 50,
    sidelobeFloorDb: -20,
    mainBeam: "sinc2",
  };
  const mount = {
    scan: { kind: "staring", fovAzDeg: 120, fovElDeg: 60 } as const,
    boresightAzDeg: 90,
    tiltDeg: 0,
  };

  it("[AP7] receive falls back to transmit; the two-way fast path is the product of the one-way gains", () => {
    expect(receiveAntenna({ txAntenna: tx })).toBe(tx);
    expect(receiveAntenna({ txAntenna: tx, rxAntenna: rx })).toBe(rx);
    const both = makeTwoWayRelativeGain({ txAntenna: tx, rxAntenna: rx, ...mount });
    const single = makeTwoWayRelativeGain({ txAntenna: tx, ...mount });
    const t = towardsTarget({ antenna: tx, ...mount }, 102.5, 0).relativeGainDb;
    const r = towardsTarget({ antenna: rx, ...mount }, 102.5, 0).relativeGainDb;
    // 12.5° off: the tx half-power point (25° beam), and the rx pattern at a quarter beamwidth.
    expect(Math.abs(t - HALF_POWER_DB)).toBeLessThan(1e-12);
    expect(Math.abs(both(102.5, 0) / dbToLinear(t + r) - 1)).toBeLessThan(1e-12);
    expect(Math.abs(single(102.5, 0) / dbToLinear(2 * t) - 1)).toBeLessThan(1e-12);
    expect(both(200, 0)).toBe(0);
  });
});

describe("[AP8] gain estimates", () => {
  it("[AP8] 41 253/(θ·θ): 1° × 1° gives 46.15 dBi (Kraus, Antennas, 2nd ed.; Balanis, Antenna Theory, 3rd ed.)", () => {
    // 4π·(180/π)² = 41 252.96 deg²; the books round to 41 253: 1e-4 dB.
    expect(Math.abs(directivityFromBeamwidthsDbi(1, 1) - linearToDb(41_253))).toBeLessThan(1e-4);
    expect(Math.abs(directivityFromBeamwidthsDbi(10, 20) - linearToDb(41_253 / 200))).toBeLessThan(1e-4);
  });

  it("[AP8] 26 000/(θ·θ): a 2° × 2° beam gives 38.1 dBi (common practice)", () => {
    expect(practicalGainFromBeamwidthsDbi(2, 2)).toBeCloseTo(linearToDb(6500), 12);
    expect(Math.abs(practicalGainFromBeamwidthsDbi(2, 2) - 38.13)).toBeLessThan(0.01);
    // The practical rule sits about 2 dB (efficiency ≈ 0.63) under the lossless one.
    const d = directivityFromBeamwidthsDbi(3, 7) - practicalGainFromBeamwidthsDbi(3, 7);
    expect(Math.abs(d - linearToDb(41_253 / 26_000))).toBeLessThan(1e-4);
  });

  it("[AP8] patch arrays at 5.8 GHz: 2×2 ≈ 10.6 dBi, 4×4 ≈ 16 dBi, each doubling ≈ 3 dB (facts of the trade, common practice)", () => {
    // "About" in the trade means ± half a dB (manufacturers' figures for such arrays scatter that much).
    expect(Math.abs(patchArrayGainDbi({ elementCount: 4 }) - 10.6)).toBeLessThan(0.5);
    expect(Math.abs(patchArrayGainDbi({ elementCount: 16 }) - 16)).toBeLessThan(0.5);
    for (const n of [1, 2, 4, 8, 16, 32]) {
      const step = patchArrayGainDbi({ elementCount: 2 * n }) - patchArrayGainDbi({ elementCount: n });
      // 10·log10(2) = 3.01 dB of array gain minus the feed loss of one more division level.
      expect(step).toBeGreaterThan(2.5);
      expect(step).toBeLessThanOrEqual(linearToDb(2));
    }
    expect(patchArrayGainDbi({ elementCount: 1, elementGainDbi: 7 })).toBe(7);
    expect(patchArrayGainDbi({ elementCount: 0 })).toBeNaN();
    expect(patchArrayGainDbi({ elementCount: 2.5 })).toBeNaN();
    expect(directivityFromBeamwidthsDbi(0, 10)).toBeNaN();
    expect(practicalGainFromBeamwidthsDbi(Number.NaN, 10)).toBeNaN();
  });
});
