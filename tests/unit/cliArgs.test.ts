import { describe, expect, it } from "vitest";
import { parseLatLon, parseNumber, UsageError } from "../../src/cli/args.ts";

describe("command-line number parsing", () => {
  it("reads decimals, exponents and fractions", () => {
    expect(parseNumber("--pfa", "1e-6")).toBe(1e-6);
    expect(parseNumber("--k", "4/3")).toBeCloseTo(4 / 3, 12);
    expect(parseNumber("--mast-m", " 12.5 ")).toBe(12.5);
  });

  it("names the flag in every error", () => {
    expect(() => parseNumber("--pfa", "abc")).toThrow(/^--pfa: "abc" is not a finite number$/);
    expect(() => parseNumber("--pfa", undefined)).toThrow(/^--pfa: a value is required$/);
    expect(() => parseNumber("--looks", "2.5", { integer: true })).toThrow(
      /^--looks: 2.5 must be a whole number$/,
    );
    expect(() => parseNumber("--mast-m", "5000", { max: 300, unit: "m" })).toThrow(
      /--mast-m: 5000 m must be ≤ 300 m/,
    );
    expect(() => parseNumber("--pd", "1", { max: 1, maxExclusive: true })).toThrow(/--pd: 1 must be < 1/);
    try {
      parseNumber("--snr-db", "NaN");
    } catch (e) {
      expect(e).toBeInstanceOf(UsageError);
      expect((e as UsageError).flag).toBe("--snr-db");
    }
  });

  it("reads LAT,LON and rejects the wrong shape", () => {
    expect(parseLatLon("--at", "47.5,11.25")).toEqual({ lat: 47.5, lon: 11.25 });
    expect(() => parseLatLon("--at", "47.5")).toThrow(/--at: expected LAT,LON/);
    expect(() => parseLatLon("--at", "133.4,-25.9")).toThrow(
      /--at: latitude 133.4° must lie within ±90° \(the order is LAT,LON: are the two swapped\?\)/,
    );
    expect(() => parseLatLon("--at", "45,200")).toThrow(/--at: longitude 200° must lie within ±180°/);
  });
});

describe("command-line output files", () => {
  it("names the flag when the output path runs through a file", async () => {
    const { mkdtempSync, writeFileSync } = await import("node:fs");
    const { tmpdir } = await import("node:os");
    const { join } = await import("node:path");
    const { ensureOutputDir, writeOutputFile } = await import("../../src/cli/cliFiles.ts");
    const dir = mkdtempSync(join(tmpdir(), "picket-out-"));
    const file = join(dir, "a-file");
    writeFileSync(file, "x");
    expect(() => ensureOutputDir("--out", join(file, "sub"))).toThrow(
      /^--out: cannot create the folder .*: a part of the path is a file, not a folder$/,
    );
    expect(() => writeOutputFile("--out", join(file, "x.tif"), "data")).toThrow(/^--out: cannot write /);
    expect(ensureOutputDir("--out", join(dir, "new", "deeper"))).toBe(join(dir, "new", "deeper"));
  });
});
