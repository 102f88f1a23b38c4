import { describe, expect, it } from "vitest";
import {
  formatDb,
  formatLatLon,
  formatLocalMinute,
  formatMemory,
  parseTypedNumber,
  tenthOfDegree,
} from "../../src/ui/numberText";

describe("shown numbers", () => {
  it("writes hemispheres as letters, never a minus sign before N or E", () => {
    expect(formatLatLon(-25.8967164, 133.3953521)).toBe("25.896716° S, 133.395352° E");
    expect(formatLatLon(47.1, -3.25)).toBe("47.100000° N, 3.250000° W");
    // Rounds to zero: no southern or western zero.
    expect(formatLatLon(-0.0000001, -0.0000004)).toBe("0.000000° N, 0.000000° E");
  });
  it("shows dB with one decimal and no negative zero", () => {
    expect(formatDb(-0.04)).toBe("0.0");
    expect(formatDb(-0.05)).toBe("-0.1");
    expect(formatDb(29.04)).toBe("29.0");
    expect(formatDb(Number.NEGATIVE_INFINITY)).toBe("−∞");
    expect(formatDb(Number.NaN)).toBe("—");
  });
  it("writes memory in MiB below 1 GiB and in GiB with two decimals from there", () => {
    expect(formatMemory(24.4 * 1024 ** 2)).toBe("24 MiB");
    expect(formatMemory(1023.6 * 1024 ** 2)).toBe("1024 MiB");
    expect(formatMemory(1024 ** 3)).toBe("1.00 GiB");
    expect(formatMemory(2.734 * 1024 ** 3)).toBe("2.73 GiB");
    expect(formatMemory(Number.NaN)).toBe("—");
  });

  it("writes a time to the minute in the local zone", () => {
    // Built from local fields, so the test holds in every time zone.
    expect(formatLocalMinute(new Date(2026, 11, 3, 7, 5, 59))).toBe("2026-12-03 07:05");
  });
  it("reads typed numbers with a decimal point or comma and fractions, and refuses what could mislead", () => {
    const value = (t: string) => {
      const r = parseTypedNumber(t);
      return r.ok ? r.value : r.reason;
    };
    expect(value(" 12.5 ")).toBe(12.5);
    expect(value("12,5")).toBe(12.5);
    expect(value("1e3")).toBe(1000);
    expect(value("4/3")).toBeCloseTo(4 / 3, 15);
    expect(value("-0.25")).toBe(-0.25);
    expect(value("0x10")).toBe('"0x10" is not a number');
    expect(value("0b101")).toBe('"0b101" is not a number');
    expect(value("20 000")).toBe('"20 000" is not a number');
    expect(value("1,000")).toBe(
      '"1,000" is ambiguous: write it without a thousands separator (use a point or a comma for decimals)',
    );
    expect(value("1/0")).toBe('"1/0" divides by zero');
    expect(value("")).toBe("is empty");
    expect(value("1e999")).toBe('"1e999" is not a finite number');
  });
  it("keeps azimuths to the shown tenth of a degree in [0, 360)", () => {
    expect(tenthOfDegree(359.96)).toBe(0);
    expect(tenthOfDegree(359.94)).toBe(359.9);
    expect(tenthOfDegree(90.04)).toBe(90);
    expect(tenthOfDegree(0)).toBe(0);
  });
});
