import { describe, expect, it } from "vitest";
import { formatDb, formatLatLon, formatLocalMinute, formatMemory } from "../../src/ui/numberText";

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
});
