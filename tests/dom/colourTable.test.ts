// @vitest-environment jsdom
import { interpolateCividis, interpolateViridis } from "d3-scale-chromatic";
import { describe, expect, it } from "vitest";
import {
  buildClassTable,
  buildColourTable,
  parseCssColour,
  TABLE_SIZE,
  tableCss,
  tableIndex,
} from "../../src/map/colourTable";

/** Relative luminance (sRGB, ITU-R BT.709 weights on linearised channels), for the monotonicity check. */
function luminance(r: number, g: number, b: number): number {
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

describe("colour tables", () => {
  it("has 256 RGBA entries sampled from the ramp ends", () => {
    const t = buildColourTable("cividis");
    expect(t.length).toBe(TABLE_SIZE * 4);
    expect(Array.from(t.slice(0, 3))).toEqual(parseCssColour(interpolateCividis(0)));
    expect(Array.from(t.slice(255 * 4, 255 * 4 + 3))).toEqual(parseCssColour(interpolateCividis(1)));
    const v = buildColourTable("viridis", 200);
    expect(Array.from(v.slice(128 * 4, 128 * 4 + 4))).toEqual([
      ...parseCssColour(interpolateViridis(128 / 255)),
      200,
    ]);
  });

  it("rises in luminance from entry 0 to 255 (a perceptually ordered ramp, no rainbow)", () => {
    for (const ramp of ["cividis", "viridis"] as const) {
      const t = buildColourTable(ramp);
      let prev = -1;
      for (let i = 0; i < TABLE_SIZE; i += 8) {
        const l = luminance(t[i * 4], t[i * 4 + 1], t[i * 4 + 2]);
        expect(l).toBeGreaterThan(prev);
        prev = l;
      }
    }
  });

  it("indexes values linearly, clamps, and leaves NaN transparent", () => {
    const s = { minValue: 0, maxValue: 1 };
    expect(tableIndex(Number.NaN, s)).toBe(-1);
    expect(tableIndex(-3, s)).toBe(0);
    expect(tableIndex(0, s)).toBe(0);
    expect(tableIndex(0.5, s)).toBe(128);
    expect(tableIndex(1, s)).toBe(255);
    expect(tableIndex(7, s)).toBe(255);
    expect(tableIndex(2, { minValue: 0, maxValue: 100 })).toBe(5);
    expect(tableIndex(5, { minValue: 1, maxValue: 1 })).toBe(255);
  });

  it("gives small integer classes evenly spaced distinct colours", () => {
    const t = buildClassTable("viridis", 4);
    const cols = [0, 1, 2, 3].map((k) => tableCss(t, k));
    expect(new Set(cols).size).toBe(4);
    expect(tableCss(t, 9)).toBe(cols[3]);
    expect(cols[3]).toBe(`rgb(${parseCssColour(interpolateViridis(1)).join(", ")})`);
  });

  it("parses both colour notations d3 returns", () => {
    expect(parseCssColour("#0a10ff")).toEqual([10, 16, 255]);
    expect(parseCssColour("rgb(1, 2, 3)")).toEqual([1, 2, 3]);
    expect(() => parseCssColour("red")).toThrow(/unknown colour/);
  });
});
