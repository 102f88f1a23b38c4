/** Property checks of the exact detection functions (docs/model-spec.md, "Detection"). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { pdExact, requiredSnrDb, type SwerlingCase, thresholdFromPfa } from "../../src/coverage/detection.ts";
import { gammaMixtureSf, marcumQ } from "../../src/coverage/marcumQ.ts";
import { dbToLinear } from "../../src/coverage/units.ts";

const swerlingArb = fc.constantFrom<SwerlingCase>(0, 1, 2, 3, 4);
const looksArb = fc.integer({ min: 1, max: 40 });
/** Pfa from 1e-9 to 1e-3, log-uniform. */
const pfaArb = fc.double({ min: -9, max: -3, noNaN: true }).map((e) => 10 ** e);
const snrDbArb = fc.double({ min: -15, max: 45, noNaN: true });
const RUNS = { numRuns: 150 };

/** Checks `holds` over every Swerling case, look count, Pfa and SNR, with one extra step drawn from `step`. */
function holdsWithStep(
  step: fc.Arbitrary<number>,
  holds: (swerling: SwerlingCase, looks: number, pfa: number, snrDb: number, step: number) => boolean,
): void {
  fc.assert(fc.property(swerlingArb, looksArb, pfaArb, snrDbArb, step, holds), RUNS);
}

describe("detection properties", () => {
  it("[PD2] Pd rises with SNR at fixed Pfa", () => {
    holdsWithStep(fc.double({ min: 0.01, max: 5, noNaN: true }), (swerling, looks, pfa, snrDb, stepDb) => {
      const lo = pdExact({ snrLinear: dbToLinear(snrDb), pfa, looks, swerling });
      const hi = pdExact({ snrLinear: dbToLinear(snrDb + stepDb), pfa, looks, swerling });
      // Strictly rising while 1 − Pd is well above the spacing of doubles just below 1 (1.1e-16);
      // closer to 1 a small step can move 1 − Pd by less than that spacing (e.g. Swerling 2, 4 looks,
      // Pfa 1e-3, 43.19 dB: 1 − Pd ≈ 6e-15), so there it must only not fall.
      return lo < 1 - 1e-12 ? hi > lo : hi >= lo;
    });
  });

  it("[PD4] Pd falls as Pfa falls at fixed SNR", () => {
    holdsWithStep(fc.double({ min: 0.1, max: 3, noNaN: true }), (swerling, looks, pfa, snrDb, decades) => {
      const snrLinear = dbToLinear(snrDb);
      const a = pdExact({ snrLinear, pfa, looks, swerling });
      const b = pdExact({ snrLinear, pfa: pfa * 10 ** -decades, looks, swerling });
      // As in PD2: strictly only while 1 − Pd is resolvable in doubles (Swerling 2, 5 looks, Pfa 1e-3,
      // 39.2 dB gives 1 − Pd near 1e-14, where a tenth of a decade of Pfa may not show).
      return a < 1 - 1e-12 ? b < a : b <= a;
    });
  });

  it("[PD5] Pd → Pfa as SNR → 0", () => {
    fc.assert(
      fc.property(swerlingArb, looksArb, pfaArb, (swerling, looks, pfa) => {
        expect(pdExact({ snrLinear: 0, pfa, looks, swerling })).toBe(pfa);
        // At 1e-9 per-look SNR, Pd − Pfa ≈ slope · SNR with slope ≤ N·T·Pfa-sized: below 1e-6 relative.
        const pd = pdExact({ snrLinear: 1e-9, pfa, looks, swerling });
        expect(pd).toBeGreaterThanOrEqual(pfa);
        expect((pd - pfa) / pfa).toBeLessThan(1e-6);
        // Never below Pfa, even where the signal term is lost to rounding.
        expect(pdExact({ snrLinear: 1e-30, pfa, looks, swerling })).toBeGreaterThanOrEqual(pfa);
      }),
      RUNS,
    );
  });

  it("[PD6] Pd → 1 at high SNR", () => {
    fc.assert(
      fc.property(swerlingArb, looksArb, pfaArb, (swerling, looks, pfa) => {
        // Slowest case is Swerling 1: 1 − Pd ≈ ln(1/Pfa)/(N·SNR) ≤ 2.1e-7 at +80 dB.
        expect(pdExact({ snrLinear: dbToLinear(80), pfa, looks, swerling })).toBeGreaterThan(1 - 1e-6);
        expect(pdExact({ snrLinear: Number.POSITIVE_INFINITY, pfa, looks, swerling })).toBe(1);
      }),
      RUNS,
    );
  });

  it("[PD7] requiredSnrDb ∘ pdExact round-trips", () => {
    fc.assert(
      fc.property(
        swerlingArb,
        looksArb,
        pfaArb,
        fc.double({ min: 0.05, max: 0.995, noNaN: true }),
        (swerling, looks, pfa, pd) => {
          const snrDb = requiredSnrDb({ pd, pfa, looks, swerling });
          const back = pdExact({ snrLinear: dbToLinear(snrDb), pfa, looks, swerling });
          // The root is converged to 1e-9 dB; |dPd/dSNR_dB| ≤ 1 per dB here, so Pd agrees to 1e-8.
          expect(Math.abs(back - pd)).toBeLessThan(1e-8);
        },
      ),
      { numRuns: 60 },
    );
  });

  it("[PD8] more looks need less per-look SNR", () => {
    fc.assert(
      fc.property(
        swerlingArb,
        fc.integer({ min: 1, max: 30 }),
        fc.integer({ min: 1, max: 10 }),
        pfaArb,
        fc.double({ min: 0.1, max: 0.99, noNaN: true }),
        (swerling, looks, extra, pfa, pd) => {
          const a = requiredSnrDb({ pd, pfa, looks, swerling });
          const b = requiredSnrDb({ pd, pfa, looks: looks + extra, swerling });
          return b < a;
        },
      ),
      { numRuns: 60 },
    );
  });

  it("[PD1] the threshold gives back Pfa with zero signal, and rises as Pfa falls", () => {
    fc.assert(
      fc.property(looksArb, pfaArb, (looks, pfa) => {
        const t = thresholdFromPfa(pfa, looks);
        const back = gammaMixtureSf({ order: looks, x: t, mean: 0, shape: Number.POSITIVE_INFINITY });
        expect(Math.abs(back / pfa - 1)).toBeLessThan(1e-12);
        expect(thresholdFromPfa(pfa / 10, looks)).toBeGreaterThan(t);
      }),
      RUNS,
    );
  });

  it("[PD3] a fluctuating target needs more SNR than a steady one at high Pd, less at low Pd", () => {
    // Fluctuation loss is positive above Pd ≈ 0.4 and negative well below (Richards FRSP 2nd ed. ch. 6, common practice).
    for (const looks of [1, 10]) {
      const steadyHigh = requiredSnrDb({ pd: 0.9, pfa: 1e-6, looks, swerling: 0 });
      const steadyLow = requiredSnrDb({ pd: 0.1, pfa: 1e-6, looks, swerling: 0 });
      for (const swerling of [1, 2, 3, 4] as const) {
        expect(requiredSnrDb({ pd: 0.9, pfa: 1e-6, looks, swerling })).toBeGreaterThan(steadyHigh);
        if (!(looks > 1 && (swerling === 2 || swerling === 4))) {
          expect(requiredSnrDb({ pd: 0.1, pfa: 1e-6, looks, swerling })).toBeLessThan(steadyLow);
        }
      }
    }
  });

  it("kernels are total: out-of-domain input gives NaN, not an exception", () => {
    const ok = { snrLinear: 10, pfa: 1e-6, looks: 4, swerling: 1 as SwerlingCase };
    expect(pdExact({ ...ok, snrLinear: Number.NaN })).toBeNaN();
    expect(pdExact({ ...ok, snrLinear: -1 })).toBeNaN();
    expect(pdExact({ ...ok, pfa: 0 })).toBeNaN();
    expect(pdExact({ ...ok, pfa: 1 })).toBeNaN();
    expect(pdExact({ ...ok, looks: 0 })).toBeNaN();
    expect(pdExact({ ...ok, looks: 2.5 })).toBeNaN();
    expect(pdExact({ ...ok, swerling: 5 as SwerlingCase })).toBeNaN();
    expect(thresholdFromPfa(Number.NaN, 1)).toBeNaN();
    expect(requiredSnrDb({ pd: 1, pfa: 1e-6, looks: 1, swerling: 0 })).toBeNaN();
    expect(requiredSnrDb({ pd: Number.NaN, pfa: 1e-6, looks: 1, swerling: 0 })).toBeNaN();
    expect(requiredSnrDb({ pd: 1e-7, pfa: 1e-6, looks: 1, swerling: 0 })).toBe(Number.NEGATIVE_INFINITY);
    expect(marcumQ(1, -1, 2)).toBeNaN();
    expect(marcumQ(1.5, 1, 2)).toBeNaN();
    expect(marcumQ(3, 2, 0)).toBe(1);
    expect(marcumQ(3, 2, Number.POSITIVE_INFINITY)).toBe(0);
    expect(gammaMixtureSf({ order: 2, x: 5, mean: 1, shape: 0.5 })).toBeNaN();
    expect(gammaMixtureSf({ order: 2, x: 5, mean: Number.NaN, shape: 2 })).toBeNaN();
  });
});
