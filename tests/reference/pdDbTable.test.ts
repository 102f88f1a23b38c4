/**
 * The Pd-by-dB table of the radar stage (src/coverage/pdDbTable.ts, rule PD14) against SciPy's Pd
 * (tests/fixtures/detection/detection.json, made by gen_detection.py with Debian's python3-scipy
 * 1.10.1) and against the exact series (pdExact, itself checked against that fixture in
 * detection.test.ts) on a dense sweep.
 */
import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { pdExact, type SwerlingCase } from "../../src/coverage/detection.ts";
import { buildPdDbTable, cachedPdDbTable, pdFromSnrDb } from "../../src/coverage/pdDbTable.ts";
import { dbToLinear } from "../../src/coverage/units.ts";

interface PdRow {
  swerling: SwerlingCase;
  looks: number;
  pfa: number;
  snrDb: number;
  pd: number;
}
const fixture: { pd: PdRow[] } = JSON.parse(
  readFileSync(new URL("../fixtures/detection/detection.json", import.meta.url), "utf8"),
);

/**
 * Interpolation bound of rule PD14: h²/8 · |d²Pd/dSNR_dB²| with nodes h = 0.01 dB apart, so 1.25e-5
 * for curves bending by up to 1 per dB²; the steepest swept (Swerling 0, N = 1000) bends by ~0.3 per
 * dB² (inferred from its measured worst error, 3.9e-6). SciPy's values are exact to ~1e-9 here.
 */
const PD_DB_TABLE_BOUND = 1.25e-5;

describe("Pd-by-dB table", () => {
  it("[PD14] matches SciPy's Pd on every fixture row (Swerling 0–4, N 1–30, Pfa 1e-3…1e-9, −10…+40 dB)", () => {
    const tables = new Map<string, ReturnType<typeof buildPdDbTable>>();
    let worst = 0;
    for (const r of fixture.pd) {
      const key = `${r.pfa}|${r.looks}|${r.swerling}`;
      let t = tables.get(key);
      if (t === undefined) {
        t = buildPdDbTable(r);
        tables.set(key, t);
      }
      const err = Math.abs(pdFromSnrDb(t, r.snrDb) - r.pd);
      worst = Math.max(worst, err);
      expect(err, `case ${r.swerling} N ${r.looks} pfa ${r.pfa} ${r.snrDb} dB`).toBeLessThan(
        PD_DB_TABLE_BOUND,
      );
    }
    console.info(`[PD14] worst |table − SciPy| over ${fixture.pd.length} rows: ${worst.toExponential(2)}`);
  });

  it("[PD14] within the interpolation bound of the exact Pd between the nodes, −40…+75 dB", () => {
    // Samples 0.0031 dB apart (not a divisor of the node step, so every phase within a bin is hit).
    let worst = 0;
    for (const [swerling, looks] of [
      [0, 1],
      [1, 1],
      [3, 30],
      [4, 30],
      [0, 1000],
    ] as [SwerlingCase, number][]) {
      const pfa = 1e-6;
      const t = buildPdDbTable({ pfa, looks, swerling });
      for (let db = -40 + 0.0013; db < 75; db += 0.0031) {
        const exact = pdExact({ snrLinear: dbToLinear(db), pfa, looks, swerling });
        worst = Math.max(worst, Math.abs(pdFromSnrDb(t, db) - exact));
      }
    }
    console.info(`[PD14] worst |table − pdExact| on the dense sweep: ${worst.toExponential(2)}`);
    expect(worst).toBeLessThan(PD_DB_TABLE_BOUND);
  }, 120_000);

  it("[PD14] edges: no echo and NaN give 0, below −40 dB Pfa, above +75 dB the top node's Pd", () => {
    const t = cachedPdDbTable(1e-6, 1, 1);
    expect(pdFromSnrDb(t, Number.NEGATIVE_INFINITY)).toBe(0);
    expect(pdFromSnrDb(t, Number.NaN)).toBe(0);
    expect(pdFromSnrDb(t, -55)).toBe(1e-6);
    expect(pdFromSnrDb(t, 90)).toBe(t.pdHigh);
    expect(pdFromSnrDb(t, Number.POSITIVE_INFINITY)).toBe(t.pdHigh);
    // Swerling 1, one look: Pd = Pfa^(1/(1+SNR)) (closed form, common practice; Richards, Fundamentals
    // of Radar Signal Processing 2nd ed., ch. 6, from memory); at +75 dB within 1e-6 of 1.
    expect(t.pdHigh).toBeCloseTo(1e-6 ** (1 / (1 + dbToLinear(75))), 6);
    expect(cachedPdDbTable(1e-6, 1, 1)).toBe(t);
  });

  it("[PD14] never decreases with SNR", () => {
    const t = cachedPdDbTable(1e-6, 4, 0);
    fc.assert(
      fc.property(
        fc.double({ min: -60, max: 90, noNaN: true }),
        fc.double({ min: 0, max: 5, noNaN: true }),
        (db, step) => {
          expect(pdFromSnrDb(t, db + step)).toBeGreaterThanOrEqual(pdFromSnrDb(t, db));
        },
      ),
    );
  });
});
