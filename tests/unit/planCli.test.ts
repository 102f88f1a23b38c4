import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { fromArrayBuffer } from "geotiff";
import proj4 from "proj4";
import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { RIDGE_SITE_CRS, ridgeCentreUtm } from "../../scripts/make-demo-dem.ts";
import { runPlan } from "../../src/cli/plan.ts";
import { encodeGeoTiff } from "../../src/io/exportGeoTiff.ts";
import type { MetricsDocument } from "../../src/io/exportMetrics.ts";
import { patchTiffEntry } from "../fixtures/dem/tiffPatch.ts";
import { sampleBand } from "../fixtures/exportGeoTiff/sample.ts";

const ridgePlan = "demo-sites/ridge-waterworks/plan.json";
const terminalPlan = "demo-sites/container-terminal/plan.json";

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const o = vi.spyOn(process.stdout, "write").mockImplementation((s: string | Uint8Array) => {
    out += String(s);
    return true;
  });
  const e = vi.spyOn(process.stderr, "write").mockImplementation((s: string | Uint8Array) => {
    err += String(s);
    return true;
  });
  try {
    const code = await runPlan(args);
    return { code, out, err };
  } finally {
    o.mockRestore();
    e.mockRestore();
  }
}

async function readTif(path: string) {
  const b = readFileSync(path);
  const image = await (
    await fromArrayBuffer(b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength))
  ).getImage();
  const [data] = (await image.readRasters()) as unknown as [Float32Array];
  return { image, data, width: image.getWidth(), height: image.getHeight() };
}

afterEach(() => vi.restoreAllMocks());

describe("GeoTIFF export", () => {
  it("[EX1] round trip: origin, cell size, EPSG, PixelIsArea, NaN nodata and values; GDAL places it as committed (gdal-view.json)", async () => {
    const band = sampleBand();
    const bytes = encodeGeoTiff(band);
    const image = await (await fromArrayBuffer(bytes)).getImage();
    const [data] = (await image.readRasters()) as unknown as [Float32Array];
    expect(image.getOrigin().slice(0, 2)).toEqual([band.frame.originX, band.frame.originY]);
    expect(image.getResolution().slice(0, 2)).toEqual([10, -10]);
    const keys = image.getGeoKeys()!;
    expect(keys.ProjectedCSTypeGeoKey).toBe(32753);
    expect(keys.GTRasterTypeGeoKey).toBe(1);
    expect(image.getGDALNoData()).toBeNaN();
    expect(Array.from(data).map((v) => (Number.isNaN(v) ? "nan" : v))).toEqual(
      Array.from(band.data).map((v) => (Number.isNaN(v) ? "nan" : v)),
    );
    // What GDAL 3.6 read from the same file (tests/fixtures/exportGeoTiff/make-fixture.sh).
    const gdal = JSON.parse(readFileSync("tests/fixtures/exportGeoTiff/gdal-view.json", "utf8"));
    expect(gdal.geoTransform).toEqual([band.frame.originX, 10, 0, band.frame.originY, 0, -10]);
    expect(gdal.epsg).toBe(32753);
    expect(gdal.areaOrPoint).toBe("Area");
    expect(gdal.values["6,4"]).toBe(String(data[4 * 7 + 6]));
    expect(gdal.values["3,0"]).toBe("nan");
    // GDAL's corner in lon/lat matches proj4's inverse of the origin to 1e-6°.
    const [lon, lat] = proj4(band.frame.crs, "WGS84", [band.frame.originX, band.frame.originY]);
    expect(lon).toBeCloseTo(gdal.cornerLonLat[0], 6);
    expect(lat).toBeCloseTo(gdal.cornerLonLat[1], 6);
  });
});

describe("plan evaluate on the demo sites", () => {
  let ridge: MetricsDocument;
  let terminal: MetricsDocument;
  const ridgeOut = mkdtempSync(join(tmpdir(), "picket-ridge-"));
  const terminalOut = mkdtempSync(join(tmpdir(), "picket-terminal-"));

  beforeAll(async () => {
    const a = await run(["evaluate", ridgePlan, "--out", ridgeOut, "--json"]);
    expect(a.err).toBe("");
    expect(a.code).toBe(0);
    ridge = JSON.parse(a.out);
    const b = await run(["evaluate", terminalPlan, "--out", terminalOut, "--json"]);
    expect(b.code).toBe(0);
    terminal = JSON.parse(b.out);
  }, 120_000);

  const fraction = (
    doc: MetricsDocument,
    target: string,
    h: number,
    region: "protectedArea" | "approachRing",
  ) =>
    doc.targets.find((t) => t.id === target)!.heights.find((x) => x.heightAglM === h)![region]
      .coveredFraction;

  it("[PC1] ridge waterworks: coverage at 60 m ≥ at 10 m, the larger class covers at least as much as the small one", () => {
    for (const t of ["quad", "fixed-wing"]) {
      for (const region of ["protectedArea", "approachRing"] as const) {
        expect(fraction(ridge, t, 60, region)).toBeGreaterThanOrEqual(fraction(ridge, t, 10, region));
      }
    }
    for (const h of [10, 30, 60]) {
      expect(fraction(ridge, "fixed-wing", h, "approachRing")).toBeGreaterThanOrEqual(
        fraction(ridge, "quad", h, "approachRing"),
      );
    }
    expect(ridge.radars).toHaveLength(7);
    expect(ridge.assumptions.ground).toBe("dem");
  });

  it("[PC2] ridge waterworks: the approach ring behind the ridge is a blind spot at 10 m; the buildings hide cells too", async () => {
    const pd = await readTif(join(ridgeOut, "pd-quad-10m.tif"));
    const lvh = await readTif(join(ridgeOut, "lowest-visible-height.tif"));
    const [cx, cy] = ridgeCentreUtm();
    const [x0, y0] = pd.image.getOrigin();
    const cell = pd.image.getResolution()[0];
    let behind = 0;
    let blind = 0;
    let hidden = 0;
    // Ring cells 540–620 m east of the centre (the crest is near 430 m), 100 m either side of the axis.
    for (let e = 540; e <= 620; e += 10)
      for (let n = -100; n <= 100; n += 10) {
        const col = Math.floor((cx + e - x0) / cell);
        const row = Math.floor((y0 - (cy + n)) / cell);
        const i = row * pd.width + col;
        behind++;
        if (pd.data[i] < 0.8) blind++;
        if (lvh.data[i] > 10) hidden++;
      }
    expect(blind / behind).toBeGreaterThan(0.9);
    expect(hidden / behind).toBeGreaterThan(0.9);
    // The same distance west of the centre (open valley) is seen from 10 m or lower.
    const colW = Math.floor((cx - 560 - x0) / cell);
    const rowW = Math.floor((y0 - cy) / cell);
    expect(lvh.data[rowW * lvh.width + colW]).toBeLessThanOrEqual(10);
    const quad10 = ridge.targets[0].heights[0];
    expect(quad10.gaps.count).toBeGreaterThan(0);
    expect(quad10.protectedArea.insideObstructionCells).toBeGreaterThan(0);
    expect(ridge.targets[0].heights[2].protectedArea.insideObstructionCells).toBe(0);
    expect(RIDGE_SITE_CRS).toContain("+zone=53");
  });

  it("[PC3] container terminal: stacks hide low targets; overlap exists; the GeoTIFFs lie on the site grid", async () => {
    const q10 = terminal.targets[0].heights.find((h) => h.heightAglM === 10)!;
    const q30 = terminal.targets[0].heights.find((h) => h.heightAglM === 30)!;
    expect(q10.protectedArea.insideObstructionAreaM2).toBeGreaterThan(10_000);
    expect(q30.protectedArea.insideObstructionAreaM2).toBeLessThan(q10.protectedArea.insideObstructionAreaM2);
    expect(q30.protectedArea.coveredFraction).toBeGreaterThan(q10.protectedArea.coveredFraction);
    expect(q30.overlapHistogram.slice(2).reduce((a, b) => a + b, 0)).toBeGreaterThan(0);
    expect(terminal.assumptions.ground).toBe("flat");
    const overlap = await readTif(join(terminalOut, "overlap-quad-30m.tif"));
    expect(overlap.width).toBe(terminal.grid.width);
    expect(overlap.image.getOrigin()[0]).toBe(terminal.grid.originX);
    expect(overlap.image.getGeoKeys()!.ProjectedCSTypeGeoKey).toBe(terminal.grid.epsg);
    expect(Math.max(...overlap.data.filter((v) => !Number.isNaN(v)))).toBeGreaterThanOrEqual(2);
  });

  it("[PC4] the text table lists every class and height", async () => {
    const r = await run(["evaluate", terminalPlan]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/quad\s+10 m/);
    expect(r.out).toMatch(/fixed-wing\s+60 m/);
    expect(r.out).not.toMatch(/fixed-wing\s+10 m/);
  });
});

describe("plan point and plan los", () => {
  it("[PC5] point: per radar and class a reason, Pd, link budget rows and the lowest visible height", async () => {
    const plan = JSON.parse(readFileSync(ridgePlan, "utf8"));
    const post = plan.posts.find((p: { id: string }) => p.id === "south-gate");
    const lat = post.position.latDeg - 0.0012; // about 130 m south, in the beam
    const pointArgs = ["point", ridgePlan, "--at", `${lat},${post.position.lonDeg}`, "--height-m", "30"];
    const r = await run([...pointArgs, "--json"]);
    expect(r.code).toBe(0);
    const res = JSON.parse(r.out);
    expect(res.rows).toHaveLength(7 * 2);
    const own = res.rows.find(
      (x: { radarId: string; targetId: string }) => x.radarId === "south-gate" && x.targetId === "quad",
    );
    expect(own.reasonText).toBe("covered");
    expect(own.linkBudget.rows.map((x: { id: string }) => x.id)).toContain("rangeFourth");
    expect(own.lowestVisibleHeightAglM).toBe(0);
    const text = await run(pointArgs);
    expect(text.out).toMatch(/South gate mast \[south-gate\] → quad: covered/);
  });

  it("[PC6] los: lowest visible height on the DEM's own grid, and 1/0 visibility with --target-m", async () => {
    const dir = mkdtempSync(join(tmpdir(), "picket-los-"));
    const [cx, cy] = ridgeCentreUtm();
    const args = [
      "los",
      "--dem",
      "demo-sites/ridge-waterworks/terrain.tif",
      "--at-xy",
      `${cx},${cy}`,
      "--mast-m",
      "10",
    ];
    const a = await run([...args, "--out", join(dir, "lvh.tif")]);
    expect(a.code).toBe(0);
    const lvh = await readTif(join(dir, "lvh.tif"));
    expect([lvh.width, lvh.height]).toEqual([600, 600]);
    expect(lvh.image.getGeoKeys()!.ProjectedCSTypeGeoKey).toBe(32753);
    expect(lvh.data[300 * 600 + 300]).toBe(0);
    // Behind the ridge crest (≈ 430 m east), 600 m east of the observer, the ground is hidden.
    expect(lvh.data[300 * 600 + 360]).toBeGreaterThan(10);
    const b = await run([...args, "--target-m", "10", "--mode", "fast", "--out", join(dir, "vis.tif")]);
    expect(b.code).toBe(0);
    const vis = await readTif(join(dir, "vis.tif"));
    expect(vis.data[300 * 600 + 310]).toBe(1);
    expect(vis.data[300 * 600 + 360]).toBe(0);
  });
});

describe("bad input names the flag or the plan field", () => {
  it("[PC7] errors: invalid plan, missing or bad flags, a point outside the grid", async () => {
    const dir = mkdtempSync(join(tmpdir(), "picket-bad-"));
    const plan = JSON.parse(readFileSync(ridgePlan, "utf8"));
    plan.posts[2].mastHeightM = 5200;
    const bad = join(dir, "bad.json");
    writeFileSync(bad, JSON.stringify(plan));
    const a = await run(["evaluate", bad]);
    expect(a.code).toBe(2);
    expect(a.err).toMatch(/posts\[2\]\.mastHeightM/);
    const b = await run([
      "los",
      "--dem",
      "demo-sites/ridge-waterworks/terrain.tif",
      "--at-xy",
      "1,2",
      "--out",
      join(dir, "x.tif"),
    ]);
    expect(b.code).toBe(2);
    expect(b.err).toMatch(/--mast-m/);
    const c = await run(["evaluate", ridgePlan, "--mode", "quick"]);
    expect(c.code).toBe(2);
    expect(c.err).toMatch(/--mode/);
    const d = await run(["point", ridgePlan, "--at", "10,10", "--height-m", "30"]);
    expect(d.code).toBe(2);
    expect(d.err).toMatch(/--at/);
    const e = await run(["point", ridgePlan, "--at", "-25.9,133.4", "--height-m", "-3"]);
    expect(e.code).toBe(2);
    expect(e.err).toMatch(/--height-m/);
    const f = await run([
      "los",
      "--dem",
      join(dir, "missing.tif"),
      "--at-xy",
      "1,2",
      "--mast-m",
      "5",
      "--out",
      join(dir, "y.tif"),
    ]);
    expect(f.code).toBe(2);
    expect(f.err).toMatch(/--dem/);
    // An output path that runs through a file is the user's to fix: named, no stack trace.
    const blocker = join(dir, "a-file");
    writeFileSync(blocker, "x");
    const g = await run(["evaluate", ridgePlan, "--out", join(blocker, "out")]);
    expect(g.code).toBe(2);
    expect(g.err).toMatch(/^plan: --out: cannot create the folder .*a part of the path is a file/);
    const h = await run(["point", ridgePlan, "--at", "133.4,-25.9", "--height-m", "10"]);
    expect(h.code).toBe(2);
    expect(h.err).toMatch(/--at: latitude 133.4° must lie within ±90° \(the order is LAT,LON/);
  });

  it("[PC8] los refuses a damaged DEM header and an implausible k by the flag, with no stack trace", async () => {
    const dir = mkdtempSync(join(tmpdir(), "picket-los-bad-"));
    const demo = readFileSync("demo-sites/ridge-waterworks/terrain.tif");
    const bytes = demo.buffer.slice(demo.byteOffset, demo.byteOffset + demo.byteLength) as ArrayBuffer;
    const los = (dem: string, ...more: string[]) =>
      run([
        "los",
        "--dem",
        dem,
        "--at",
        "-25.9,133.4",
        "--mast-m",
        "10",
        "--out",
        join(dir, "o.tif"),
        ...more,
      ]);
    // ModelPixelScale (33550) renamed to a private tag: no georeferencing left.
    const noScale = join(dir, "no-scale.tif");
    writeFileSync(noScale, new Uint8Array(patchTiffEntry(bytes, 33_550, { tag: 65_000 })));
    const a = await los(noScale);
    expect(a.code).toBe(2);
    expect(a.err).toMatch(/^plan: --dem: no-scale\.tif: ModelPixelScale: no georeferencing/);
    // GeoAsciiParams (34737) renamed: the GeoKeys point at a tag the file lacks.
    const noAscii = join(dir, "no-ascii.tif");
    writeFileSync(noAscii, new Uint8Array(patchTiffEntry(bytes, 34_737, { tag: 65_003 })));
    const b = await los(noAscii);
    expect(b.code).toBe(2);
    expect(b.err).toMatch(/^plan: --dem: no-ascii\.tif: GeoKeyDirectory: damaged GeoKeys/);
    // k as a plan allows it (0.5–1000), not any positive number.
    const c = await los("demo-sites/ridge-waterworks/terrain.tif", "--k", "1e-100");
    expect(c.code).toBe(2);
    expect(c.err).toMatch(/--k: 1e-100 must be ≥ 0\.5/);
  });

  it("[PC9] a post far from the site is named by its index and name, disabled or not", async () => {
    const plan = JSON.parse(readFileSync(ridgePlan, "utf8"));
    const i = plan.posts.findIndex((p: { enabled: boolean }) => !p.enabled);
    plan.posts[i].position = { latDeg: 0, lonDeg: 0 };
    plan.terrain.ground.file = resolve("demo-sites/ridge-waterworks", plan.terrain.ground.file);
    const dir = mkdtempSync(join(tmpdir(), "picket-far-"));
    const file = join(dir, "plan.json");
    writeFileSync(file, JSON.stringify(plan));
    const r = await run(["evaluate", file]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`posts[${i}].position: the site grid would be`);
    expect(r.err).toContain(`post "${plan.posts[i].name}" (disabled) at 0, 0 lies`);
  });
});
