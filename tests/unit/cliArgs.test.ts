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
    expect(() => parseLatLon("--at", "95,11")).toThrow(/--at: 95° must be ≤ 90°/);
  });
});
