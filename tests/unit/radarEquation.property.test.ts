/** Property checks of the radar equation and the link budget (fast-check). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { makeTwoWayRelativeGain, towardsTarget } from "../../src/coverage/antennaPattern.ts";
import { linkBudget, sumOfTermsDb } from "../../src/coverage/linkBudget.ts";
import {
  type RadarEquationParams,
  rangeForSnr,
  rangeForSnrWithAttenuation,
  snrAtRange,
  snrAtRangeDb,
  snrConstant,
  twoWayFactorFromOneWayLossDb,
} from "../../src/coverage/radarEquation.ts";
import type { AntennaSpec, ScanMode } from "../../src/coverage/radarModel.ts";
import { dbToLinear } from "../../src/coverage/units.ts";

/** Radar-equation parameters over the span of real radars: mW to MW, 100 MHz to 100 GHz, ns to ms. */
const params: fc.Arbitrary<RadarEquationParams> = fc.record({
  peakPowerW: fc.double({ min: 1e-3, max: 1e7, noNaN: true }),
  pulseDurationS: fc.double({ min: 1e-9, max: 1e-2, noNaN: true }),
  pulsesIntegrated: fc.integer({ min: 1, max: 4096 }),
  frequencyHz: fc.double({ min: 1e8, max: 1e11, noNaN: true }),
  txGainDbi: fc.double({ min: -10, max: 50, noNaN: true }),
  rxGainDbi: fc.double({ min: -10, max: 50, noNaN: true }),
  rcsM2: fc.double({ min: 1e-5, max: 1e4, noNaN: true }),
  noiseFigureDb: fc.double({ min: 0, max: 20, noNaN: true }),
  systemLossDb: fc.double({ min: 0, max: 30, noNaN: true }),
  atmosphericLossDb: fc.double({ min: 0, max: 10, noNaN: true }),
  rainLossDb: fc.double({ min: 0, max: 10, noNaN: true }),
  propagationFactorDb: fc.double({ min: -60, max: 12, noNaN: true }),
  noiseBandwidthHz: fc.double({ min: 1e3, max: 1e10, noNaN: true }),
});
const rangeM = fc.double({ min: 1, max: 1e6, noNaN: true });

describe("radar equation properties", () => {
  it("[RE1] SNR falls as R^-4: SNR·R⁴ is constant and doubling the range costs 16× (12.04 dB)", () => {
    fc.assert(
      fc.property(params, rangeM, (p, r) => {
        const s = snrAtRange(p, r);
        const c = snrConstant(p) * dbToLinear(p.propagationFactorDb ?? 0);
        // Relative 1e-12: a handful of floating multiplications and one division.
        expect(Math.abs((s * r ** 4) / c - 1)).toBeLessThan(1e-12);
        expect(Math.abs(snrAtRange(p, 2 * r) / (s / 16) - 1)).toBeLessThan(1e-12);
        expect(snrAtRange(p, r * 1.001)).toBeLessThan(s);
      }),
    );
  });

  it("[RE4] round trip SNR → range → SNR and range → SNR → range", () => {
    fc.assert(
      fc.property(params, rangeM, fc.double({ min: -20, max: 40, noNaN: true }), (p, r, snrDb) => {
        const back = rangeForSnr(p, snrAtRangeDb(p, r));
        // dB → linear → fourth root: relative 1e-12 on the range.
        expect(Math.abs(back / r - 1)).toBeLessThan(1e-12);
        // And from an SNR: 1e-9 dB (the log of a quotient, absolute in dB).
        expect(Math.abs(snrAtRangeDb(p, rangeForSnr(p, snrDb)) - snrDb)).toBeLessThan(1e-9);
      }),
    );
  });

  it("[RE4] range with attenuation: the SNR there, with the two-way path loss added, is the required SNR", () => {
    fc.assert(
      fc.property(
        params,
        fc.double({ min: -10, max: 30, noNaN: true }),
        fc.double({ min: 0, max: 20, noNaN: true }),
        (p, snrDb, gammaDbPerKm) => {
          const r = rangeForSnrWithAttenuation(p, snrDb, gammaDbPerKm);
          expect(r).toBeLessThanOrEqual(rangeForSnr(p, snrDb));
          const pathLossDb = (2 * gammaDbPerKm * r) / 1000;
          const atR = snrAtRangeDb({ ...p, atmosphericLossDb: (p.atmosphericLossDb ?? 0) + pathLossDb }, r);
          // Newton to 1e-14 in ln R: the SNR residual is below 1e-9 dB.
          expect(Math.abs(atR - snrDb)).toBeLessThan(1e-9);
        },
      ),
    );
    const p0 = { ...fc.sample(params, { numRuns: 1, seed: 1 })[0] };
    expect(rangeForSnrWithAttenuation(p0, 10, 0)).toBe(rangeForSnr(p0, 10));
    expect(rangeForSnrWithAttenuation(p0, 10, -1)).toBeNaN();
    expect(rangeForSnrWithAttenuation(p0, Number.NaN, 1)).toBeNaN();
  });

  it("[RE5] the link-budget rows sum to the SNR for any noise bandwidth", () => {
    fc.assert(
      fc.property(params, rangeM, (p, r) => {
        const b = linkBudget(p, r);
        // Fourteen dB terms of magnitude ≤ 250 dB: rounding ≤ 1e-12; 1e-9 dB is generous.
        expect(Math.abs(sumOfTermsDb(b) - b.snrDb)).toBeLessThan(1e-9);
        expect(Math.abs(b.snrDb - snrAtRangeDb(p, r))).toBe(0);
        const other = linkBudget({ ...p, noiseBandwidthHz: (p.noiseBandwidthHz ?? 1) * 7 }, r);
        expect(Math.abs(sumOfTermsDb(other) - b.snrDb)).toBeLessThan(1e-9);
        expect(b.rows.at(-1)?.kind).toBe("result");
      }),
    );
  });

  it("[RE3] SNR depends on peak power, pulse duration and count only through their product (energy)", () => {
    fc.assert(
      fc.property(params, rangeM, fc.double({ min: 0.01, max: 100, noNaN: true }), (p, r, k) => {
        const a = snrAtRange(p, r);
        const b = snrAtRange({ ...p, peakPowerW: p.peakPowerW * k, pulseDurationS: p.pulseDurationS / k }, r);
        expect(Math.abs(b / a - 1)).toBeLessThan(1e-12);
        const n2 = snrAtRange({ ...p, pulsesIntegrated: p.pulsesIntegrated * 2 }, r);
        expect(Math.abs(n2 / a - 2)).toBeLessThan(1e-12);
      }),
    );
  });

  it("[RE6] kernel form C·g_t·g_r·F⁴/R⁴ equals snrAtRange with the gains towards the target", () => {
    const tx: AntennaSpec = {
      peakGainDbi: 20,
      azBeamwidthDeg: 12,
      elBeamwidthDeg: 20,
      sidelobeFloorDb: -30,
      mainBeam: "gaussian",
    };
    const rx: AntennaSpec = {
      peakGainDbi: 14,
      azBeamwidthDeg: 40,
      elBeamwidthDeg: 30,
      sidelobeFloorDb: -22,
      mainBeam: "sinc2",
    };
    const scan: ScanMode = { kind: "sector", sectorWidthDeg: 60, fovElDeg: 60 };
    const mount = { scan, boresightAzDeg: 40, tiltDeg: 3 };
    const twoWay = makeTwoWayRelativeGain({ txAntenna: tx, rxAntenna: rx, ...mount });
    fc.assert(
      fc.property(
        params,
        rangeM,
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: -25, max: 30, noNaN: true }),
        fc.double({ min: 0, max: 30, noNaN: true }),
        (p, r, azDeg, elDeg, oneWayLossDb) => {
          const peak = { ...p, txGainDbi: tx.peakGainDbi, rxGainDbi: rx.peakGainDbi, propagationFactorDb: 0 };
          const kernel =
            (snrConstant(peak) * twoWay(azDeg, elDeg) * twoWayFactorFromOneWayLossDb(oneWayLossDb)) / r ** 4;
          const gt = towardsTarget({ antenna: tx, ...mount }, azDeg, elDeg).gainDbi;
          const gr = towardsTarget({ antenna: rx, ...mount }, azDeg, elDeg).gainDbi;
          const direct = snrAtRange(
            { ...peak, txGainDbi: gt, rxGainDbi: gr, propagationFactorDb: -2 * oneWayLossDb },
            r,
          );
          // Two paths through exp/log10 and products: relative 1e-9.
          expect(Math.abs(kernel / direct - 1)).toBeLessThan(1e-9);
        },
      ),
    );
  });

  it("[RE7] edges: R = 0 → +Infinity, R < 0 or NaN → NaN, zero power or RCS → 0, NaN parameter → NaN", () => {
    fc.assert(
      fc.property(params, (p) => {
        expect(snrAtRange(p, 0)).toBe(Number.POSITIVE_INFINITY);
        expect(snrAtRange(p, Number.POSITIVE_INFINITY)).toBe(0);
        expect(snrAtRange(p, -1)).toBeNaN();
        expect(snrAtRange(p, Number.NaN)).toBeNaN();
        expect(snrAtRange({ ...p, peakPowerW: 0 }, 1000)).toBe(0);
        expect(snrAtRange({ ...p, rcsM2: 0 }, 0)).toBe(0);
        expect(rangeForSnr({ ...p, rcsM2: 0 }, 10)).toBe(0);
        expect(rangeForSnr(p, Number.NEGATIVE_INFINITY)).toBe(Number.POSITIVE_INFINITY);
        expect(rangeForSnr(p, Number.NaN)).toBeNaN();
        for (const key of [
          "peakPowerW",
          "frequencyHz",
          "txGainDbi",
          "noiseFigureDb",
          "systemLossDb",
          "rcsM2",
        ] as const) {
          expect(snrAtRange({ ...p, [key]: Number.NaN }, 1000)).toBeNaN();
        }
        expect(snrAtRange({ ...p, frequencyHz: -1 }, 1000)).toBeNaN();
        expect(snrAtRange({ ...p, pulsesIntegrated: 0 }, 1000)).toBeNaN();
        expect(snrAtRange({ ...p, propagationFactorDb: Number.NEGATIVE_INFINITY }, 1000)).toBe(0);
      }),
    );
  });
});
