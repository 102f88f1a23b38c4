import { describe, expect, it } from "vitest";
import radar from "../../demo-sites/radars/zorvane-s24-staring-fmcw.json";
import { cutRelativeDb } from "../../src/coverage/antennaPattern.ts";
import { parsePatternCsv } from "../../src/io/patternCsv.ts";
import { parseRadarModel } from "../../src/io/radarSchema.ts";

describe("pattern cut CSV import", () => {
  it("reads a headed file, sorts angles, and the cut interpolates linearly in dB", () => {
    const r = parsePatternCsv("angle_deg,gain_db\n10,-3\n-10,-3\n0,0\n20,-12\n-20,-12\n", "az.csv");
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.cut.angleDeg).toEqual([-20, -10, 0, 10, 20]);
    expect(r.cut.relativeGainDb).toEqual([-12, -3, 0, -3, -12]);
    expect(r.warnings).toEqual([]);
    expect(cutRelativeDb(r.cut, 5)).toBeCloseTo(-1.5, 12);
    expect(cutRelativeDb(r.cut, -15)).toBeCloseTo(-7.5, 12);
  });

  it("reads semicolon files with decimal commas and no header, normalising absolute gains to the peak", () => {
    const r = parsePatternCsv("-5;14,5\n0;17,5\n5;14,5\n", "el.csv");
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.cut.relativeGainDb).toEqual([-3, 0, -3]);
    expect(r.warnings[0]).toMatch(/normalised to the cut's peak \(17.50 dB\)/);
  });

  it("names the row and column of every bad value", () => {
    const r = parsePatternCsv("angle,gain\n0,0\nten,-3\n200,-5\n30,loud\n", "bad.csv");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toEqual([
      'bad.csv: row 3, column "angle": "ten" is not a number',
      'bad.csv: row 4, column "angle": 200° lies outside −180° to 180°',
      'bad.csv: row 5, column "gain": "loud" is not a number',
    ]);
  });

  it("refuses an empty file, a single angle and a repeated angle", () => {
    expect(parsePatternCsv("", "e.csv")).toEqual({ ok: false, errors: ["e.csv: the file has no rows"] });
    expect(parsePatternCsv("0,0\n", "one.csv")).toEqual({
      ok: false,
      errors: ["one.csv: a cut needs at least two angles"],
    });
    expect(parsePatternCsv("0,0\n5,-3\n5,-4\n", "dup.csv")).toEqual({
      ok: false,
      errors: ["dup.csv: the angle 5° appears twice"],
    });
  });

  it("an imported cut is accepted by the radar model schema", () => {
    const r = parsePatternCsv("-30,-20\n-10,-3\n0,0\n10,-3\n30,-20\n", "az.csv");
    if (!r.ok) throw new Error(r.errors.join("\n"));
    const model = { ...radar, txAntenna: { ...radar.txAntenna, azCut: r.cut } };
    const parsed = parseRadarModel(model);
    expect(parsed.ok).toBe(true);
  });
});
