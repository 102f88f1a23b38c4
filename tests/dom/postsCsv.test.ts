// @vitest-environment jsdom
import { forward as mgrsForward } from "mgrs";
import proj4 from "proj4";
import { describe, expect, it } from "vitest";
import { formatCsvErrors, parseNumberCell, parsePostsCsv } from "../../src/ui/import/postsCsv";

describe("posts CSV import", () => {
  it("reads lat/lon columns with a decimal comma and optional fields", () => {
    const r = parsePostsCsv(
      "Name;Latitude;Longitude;mast_height_m\nNorth gate;47,1012;15,2991;12\nTank;47.0990;15.3020;\n",
    );
    expect(r.errors).toEqual([]);
    expect(r.positionColumns).toBe("latlon");
    expect(r.posts).toHaveLength(2);
    expect(r.posts[0]).toMatchObject({
      name: "North gate",
      latDeg: 47.1012,
      lonDeg: 15.2991,
      mastHeightM: 12,
    });
    expect(r.posts[1].mastHeightM).toBeUndefined();
  });

  it("reads UTM columns (zone with hemisphere letter) back to the same lon/lat as proj4", () => {
    const crs = "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs";
    const [e, n] = proj4("EPSG:4326", crs, [15.3, 47.1]);
    const r = parsePostsCsv(`name,utm_zone,easting,northing\nA,33N,${e.toFixed(3)},${n.toFixed(3)}\n`);
    expect(r.errors).toEqual([]);
    expect(r.posts[0].lonDeg).toBeCloseTo(15.3, 7);
    expect(r.posts[0].latDeg).toBeCloseTo(47.1, 7);
  });

  it("reads MGRS references (1 m precision lands within 1e-4° of the point)", () => {
    const ref = mgrsForward([15.3, 47.1], 5);
    const r = parsePostsCsv(`name,mgrs\nRoof,${ref}\n`);
    expect(r.errors).toEqual([]);
    expect(r.posts[0].lonDeg).toBeCloseTo(15.3, 4);
    expect(r.posts[0].latDeg).toBeCloseTo(47.1, 4);
  });

  it("names the row and column of every bad value and keeps the good rows", () => {
    const r = parsePostsCsv(
      "name,lat,lon,mast_height_m\nok,47.1,15.3,10\nbad lat,97,15.3,10\nbad mast,47.1,15.3,5200\nbad lon,47.1,abc,\n",
    );
    expect(r.posts.map((p) => p.name)).toEqual(["ok"]);
    const lines = formatCsvErrors("posts.csv", r.errors);
    expect(lines).toEqual([
      'posts.csv: row 3, column lat: "97" is not a latitude in −90…90°',
      'posts.csv: row 4, column mast_height_m: "5200" is not a mast height in 0–300 m',
      'posts.csv: row 5, column lon: "abc" is not a longitude in −180…180°',
    ]);
  });

  it("refuses a file without position columns, saying what it found", () => {
    const r = parsePostsCsv("a,b\n1,2\n");
    expect(r.posts).toEqual([]);
    expect(r.errors[0].message).toMatch(/no position columns.*found: a, b/);
  });

  it("parses numbers strictly", () => {
    expect(parseNumberCell(" 12.5 ")).toBe(12.5);
    expect(parseNumberCell("12,5")).toBe(12.5);
    expect(parseNumberCell("1,234,5")).toBeNaN();
    expect(parseNumberCell("")).toBeNaN();
    expect(parseNumberCell("1e3")).toBe(1000);
    expect(parseNumberCell("12m")).toBeNaN();
  });
});
