/** The fast Pd table against the exact function (docs/model-spec.md, "Detection", PD11–PD13). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { pdExact, type SwerlingCase } from "../../src/coverage/detection.ts";
import { buildPdTable, pdFromSnr, pdFromSnrArray } from "../../src/coverage/pdTable.ts";
import { dbToLinear } from "../../src/coverage/units.ts";

const CASES: SwerlingCase[] = [0, 1, 2, 3, 4];
const LOOKS = [1, 4, 10, 30];
const PFAS = [1e-3, 1e-6, 1e-9];
/** Table budget in Pd points (issue requirement: ≤ 1e-4). */
const PD_TABLE_BUDGET = 1e-4;

describe("Pd table", () => {
  it("[PD11] worst |table − exact| over −20…+50 dB is within 1e-4 for every case, N and Pfa", () => {
    // Dense sweep: 0.005 dB steps (≈ 3.4 samples per bin of 0.017 dB at the narrowest), offset so
    // the samples fall at every phase within a bin, across 60 settings.
    const stepDb = 0.005;
    let worst = 0;
    let at = "";
    const lines: string[] = [];
    for (const swerling of CASES) {
      for (const looks of LOOKS) {
        for (const pfa of PFAS) {
          const table = buildPdTable({ pfa, looks, swerling });
          let w = 0;
          let wDb = 0;
          for (let db = -20 + 0.0013; db <= 50; db += stepDb) {
            const snrLinear = dbToLinear(db);
            const err = Math.abs(pdFromSnr(table, snrLinear) - pdExact({ snrLinear, pfa, looks, swerling }));
            if (err > w) {
              w = err;
              wDb = db;
            }
          }
          lines.push(`case ${swerling} N ${looks} pfa ${pfa}: ${w.toExponential(2)} at ${wDb.toFixed(2)} dB`);
          if (w > worst) {
            worst = w;
            at = lines[lines.length - 1];
          }
        }
      }
    }
    console.info(`[PD11] Pd table worst |error| vs pdExact, −20…+50 dB: ${worst.toExponential(3)} (${at})`);
    expect(worst).toBeLessThanOrEqual(PD_TABLE_BUDGET);
  }, 120_000);

  it("[PD11] many looks (N = 100, 1000), where Pd rises most steeply, stay within 1e-4", () => {
    // Steeper curves raise the interpolation error ∝ curvature · bin²; measured ≤ 1.8e-5.
    let worst = 0;
    for (const looks of [100, 1000]) {
      for (const swerling of [0, 4] as const) {
        const table = buildPdTable({ pfa: 1e-9, looks, swerling });
        for (let db = -20 + 0.0007; db <= 50; db += 0.005) {
          const snrLinear = dbToLinear(db);
          const err = Math.abs(
            pdFromSnr(table, snrLinear) - pdExact({ snrLinear, pfa: 1e-9, looks, swerling }),
          );
          worst = Math.max(worst, err);
        }
      }
    }
    console.info(`[PD11] Pd table worst |error| for N = 100 and 1000: ${worst.toExponential(3)}`);
    expect(worst).toBeLessThanOrEqual(PD_TABLE_BUDGET);
  }, 120_000);

  it("[PD11] the table is exact at its nodes (Float32 rounding only) and non-decreasing", () => {
    const table = buildPdTable({ pfa: 1e-6, looks: 10, swerling: 1 });
    for (let j = 1; j < table.values.length; j++)
      expect(table.values[j]).toBeGreaterThanOrEqual(table.values[j - 1]);
    const scratch = new Float32Array(1);
    const bits = new Uint32Array(scratch.buffer);
    for (const j of [0, 100, 2000, 4321, table.values.length - 1]) {
      bits[0] = table.bitsLow + j * (1 << table.shift);
      const exact = pdExact({ snrLinear: scratch[0], pfa: 1e-6, looks: 10, swerling: 1 });
      // Float32 storage: half an ulp of a value ≤ 1 is ≤ 6e-8.
      expect(Math.abs(table.values[j] - exact)).toBeLessThan(6e-8);
      expect(Math.abs(pdFromSnr(table, scratch[0]) - exact)).toBeLessThan(6e-8);
    }
  });

  it("[PD12] edges: NaN, zero and negative SNR give 0; tiny SNR gives ≈ Pfa; huge SNR gives ≈ 1", () => {
    const table = buildPdTable({ pfa: 1e-6, looks: 4, swerling: 2 });
    expect(pdFromSnr(table, Number.NaN)).toBe(0);
    expect(pdFromSnr(table, -Number.NaN)).toBe(0);
    expect(pdFromSnr(table, 0)).toBe(0);
    expect(pdFromSnr(table, -0)).toBe(0);
    expect(pdFromSnr(table, -3)).toBe(0);
    expect(pdFromSnr(table, Number.NEGATIVE_INFINITY)).toBe(0);
    // Below 2^-10 the chord from (0, Pfa): at 1e-6 and at the smallest subnormal Float32.
    expect(
      Math.abs(pdFromSnr(table, 1e-6) - pdExact({ snrLinear: 1e-6, pfa: 1e-6, looks: 4, swerling: 2 })),
    ).toBeLessThan(1e-10);
    expect(pdFromSnr(table, 1.4e-45)).toBeCloseTo(1e-6, 12);
    // Above 2^24 (+72 dB) and at +Infinity: held at the last node, within 2e-6 of 1.
    expect(pdFromSnr(table, 1e9)).toBe(table.pdHigh);
    expect(pdFromSnr(table, Number.POSITIVE_INFINITY)).toBe(table.pdHigh);
    expect(table.pdHigh).toBeGreaterThan(1 - 2e-6);
  });

  it("[PD12] the slowest case still reaches 1 − 2e-6 at the top node (Swerling 1, one look, Pfa 1e-9)", () => {
    // 1 − Pd ≈ ln(1/Pfa)/(1 + SNR) = 20.7 / 2^24 ≈ 1.2e-6.
    expect(buildPdTable({ pfa: 1e-9, looks: 1, swerling: 1 }).pdHigh).toBeGreaterThan(1 - 2e-6);
  });

  it("[PD13] pdFromSnrArray equals pdFromSnr element by element, also in place", () => {
    const table = buildPdTable({ pfa: 1e-4, looks: 10, swerling: 3 });
    fc.assert(
      fc.property(
        fc.array(
          fc.oneof(
            fc.double({ min: -30, max: 80, noNaN: true }).map((db) => dbToLinear(db)),
            fc.constantFrom(0, -0, -1, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 1e-40),
          ),
          { minLength: 1, maxLength: 64 },
        ),
        (values) => {
          const snr = Float32Array.from(values);
          const out = new Float32Array(snr.length);
          pdFromSnrArray(table, snr, out);
          for (let i = 0; i < snr.length; i++) expect(out[i]).toBe(Math.fround(pdFromSnr(table, snr[i])));
          const inPlace = Float32Array.from(snr);
          pdFromSnrArray(table, inPlace, inPlace);
          expect(Array.from(inPlace)).toEqual(Array.from(out));
        },
      ),
      { numRuns: 100 },
    );
  });

  it("[PD13] pdFromSnrArray reads a sub-array view at its offset", () => {
    const table = buildPdTable({ pfa: 1e-6, looks: 1, swerling: 0 });
    const whole = Float32Array.from([1, 10, 20, 30, 40]);
    const view = whole.subarray(2, 4);
    const out = new Float32Array(2);
    pdFromSnrArray(table, view, out);
    expect(out[0]).toBe(Math.fround(pdFromSnr(table, 20)));
    expect(out[1]).toBe(Math.fround(pdFromSnr(table, 30)));
  });

  it("bad input: a short output array and bad table options throw a RangeError naming the field", () => {
    const table = buildPdTable({ pfa: 1e-6, looks: 1, swerling: 0 });
    expect(() => pdFromSnrArray(table, new Float32Array(4), new Float32Array(3))).toThrow(/pdOut\.length: 3/);
    expect(() => buildPdTable({ pfa: 0, looks: 1, swerling: 0 })).toThrow(/^pfa: 0 must be in \(0, 1\)/);
    expect(() => buildPdTable({ pfa: 1e-6, looks: 0.5, swerling: 0 })).toThrow(/^looks: 0\.5/);
    expect(() => buildPdTable({ pfa: 1e-6, looks: 1, swerling: 7 as SwerlingCase })).toThrow(/^swerling: 7/);
  });
});
