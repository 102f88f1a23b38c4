import { readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { DEFAULT_EFFECTIVE_EARTH_FACTOR } from "../../src/coverage/constants.ts";
import { jsonSchemaText, planJsonSchema, radarJsonSchema } from "../../src/io/planJsonSchema.ts";
import { migratePlan, migrateV0toV1 } from "../../src/io/planMigrations.ts";
import { PLAN_VERSION } from "../../src/io/planSchema.ts";
import { loadPlanFile, parsePlan, radarModelOfPost } from "../../src/io/planValidation.ts";

const FIXTURES = join(import.meta.dirname, "../fixtures/planFormat");
const v1Text = readFileSync(join(FIXTURES, "example-plan.v1.json"), "utf8");
const v0Text = readFileSync(join(FIXTURES, "example-plan.v0.json"), "utf8");

// biome-ignore lint/suspicious/noExplicitAny: tests edit raw JSON documents freely
type Json = any;
const v1 = (): Json => JSON.parse(v1Text);
const v0 = (): Json => JSON.parse(v0Text);

function errorsOf(json: unknown): Record<string, string> {
  const r = parsePlan(json);
  if (r.ok) return {};
  return Object.fromEntries(r.errors.map((e) => [e.path, e.message]));
}

function deepFreeze<T>(v: T): T {
  if (typeof v === "object" && v !== null) {
    for (const k of Object.keys(v)) deepFreeze((v as Record<string, unknown>)[k]);
    Object.freeze(v);
  }
  return v;
}

/** Every path to a value inside a JSON document (objects and arrays included). */
function allPaths(v: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  const out: (string | number)[][] = [prefix];
  if (Array.isArray(v)) {
    v.forEach((x, i) => {
      out.push(...allPaths(x, [...prefix, i]));
    });
  } else if (typeof v === "object" && v !== null) {
    for (const [k, x] of Object.entries(v)) out.push(...allPaths(x, [...prefix, k]));
  }
  return out;
}

function setPath(doc: Json, path: (string | number)[], value: unknown): Json {
  if (path.length === 0) return value;
  let o = doc;
  for (let i = 0; i < path.length - 1; i++) o = o[path[i]];
  o[path[path.length - 1]] = value;
  return doc;
}

describe("plan format", () => {
  it("[PF1] the example plan validates and optional fields get their defaults", () => {
    const r = parsePlan(v1());
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.fromVersion).toBe(PLAN_VERSION);
    expect(r.plan.posts[0].enabled).toBe(true);
    expect(r.plan.posts[1].enabled).toBe(false);
    expect(r.plan.radarModels[0].txAntenna.mainBeam).toBe("sinc2");
    expect(r.plan.posts[1].radarModel?.txAntenna.mainBeam).toBe("gaussian");
    expect(radarModelOfPost(r.plan, r.plan.posts[0])?.id).toBe("kalvori-x9");
    expect(radarModelOfPost(r.plan, r.plan.posts[1])?.id).toBe("inline-staring");
    const minimal = v1();
    delete minimal.analysis.cellSizeM;
    delete minimal.analysis.effectiveEarthFactor;
    delete minimal.analysis.maskMode;
    delete minimal.terrain.buildings;
    delete minimal.terrain.treeStands;
    const m = parsePlan(minimal);
    if (!m.ok) throw new Error(JSON.stringify(m.errors));
    expect(m.plan.analysis).toMatchObject({
      cellSizeM: "auto",
      effectiveEarthFactor: DEFAULT_EFFECTIVE_EARTH_FACTOR,
      maskMode: "accurate",
    });
    expect(m.plan.terrain.buildings.features).toEqual([]);
    expect(m.plan.terrain.treeStands).toEqual([]);
  });

  it("[PF2] an out-of-range value names its path, value and limit", () => {
    const p = v1();
    p.posts[1].mastHeightM = 5200;
    expect(errorsOf(p)).toEqual({ "posts[1].mastHeightM": "5200 is above the 300 m limit" });
    const q = v1();
    q.requirement.requiredPd = 1;
    q.targetClasses[0].swerling = 5;
    q.posts[0].boresightAzDeg = 360;
    q.approachRingDepthM = -1;
    expect(errorsOf(q)).toEqual({
      "requirement.requiredPd": "must be < 1 (got 1)",
      "targetClasses[0].swerling": "must be a Swerling case 0, 1, 2, 3 or 4 (got 5)",
      "posts[0].boresightAzDeg": "must be < 360 deg (got 360)",
      approachRingDepthM: "-1 is below the 0 m limit",
    });
  });

  it("[PF2] NaN, Infinity, strings and missing values are rejected by name", () => {
    const p = v1();
    p.posts[0].tiltDeg = Number.NaN;
    p.posts[0].position.lonDeg = Number.POSITIVE_INFINITY;
    p.targetClasses[1].rcsDbsm = "-10";
    delete p.requirement.pfa;
    expect(errorsOf(p)).toEqual({
      "posts[0].tiltDeg": "must be a finite number in deg (got NaN)",
      "posts[0].position.lonDeg": "must be a finite number in deg (got Infinity)",
      "targetClasses[1].rcsDbsm": 'must be a finite number in dBsm (got "-10")',
      "requirement.pfa": "is required (a number)",
    });
    // A missing list says so in the same words, not in the schema library's.
    const q = v1();
    delete q.protectedAreas;
    expect(errorsOf(q)).toEqual({ protectedAreas: "is required (a list)" });
  });

  it("[PF2] a misspelt field is an error, not silently dropped", () => {
    const p = v1();
    p.posts[0].mastHeigthM = 12;
    expect(errorsOf(p)).toEqual({ "posts[0].mastHeigthM": "unknown field" });
  });

  it("[PF3] self-intersecting polygons are rejected; holes are allowed", () => {
    const p = v1();
    p.protectedAreas[0].geometry.coordinates[0] = [
      [16.05, 62.3],
      [16.056, 62.303],
      [16.056, 62.3],
      [16.05, 62.303],
      [16.05, 62.3],
    ];
    const e = errorsOf(p);
    expect(Object.keys(e)).toEqual(["protectedAreas[0].geometry.coordinates[0]"]);
    expect(e["protectedAreas[0].geometry.coordinates[0]"]).toMatch(
      /^the ring crosses itself near lon 16\.053000/,
    );

    const m = v1();
    m.protectedAreas[1].geometry.coordinates[1][0] = [
      [16.063, 62.3],
      [16.064, 62.3008],
      [16.064, 62.3],
      [16.063, 62.3008],
      [16.063, 62.3],
    ];
    expect(Object.keys(errorsOf(m))).toEqual(["protectedAreas[1].geometry.coordinates[1][0]"]);
  });

  it("[PF3] holes crossing or outside the outline, open rings and degenerate rings are rejected", () => {
    const crossing = v1();
    crossing.protectedAreas[0].geometry.coordinates[1] = [
      [16.055, 62.301],
      [16.058, 62.301],
      [16.058, 62.302],
      [16.055, 62.302],
      [16.055, 62.301],
    ];
    expect(errorsOf(crossing)["protectedAreas[0].geometry.coordinates"]).toMatch(
      /^a hole crosses another ring/,
    );

    const outside = v1();
    outside.protectedAreas[0].geometry.coordinates[1] = [
      [16.07, 62.301],
      [16.071, 62.301],
      [16.071, 62.302],
      [16.07, 62.301],
    ];
    expect(errorsOf(outside)).toEqual({
      "protectedAreas[0].geometry.coordinates[1]": "the hole lies outside the outer ring",
    });

    const open = v1();
    open.protectedAreas[0].geometry.coordinates[0].pop();
    open.protectedAreas[0].geometry.coordinates[0].push([16.0501, 62.3]);
    expect(errorsOf(open)).toEqual({
      "protectedAreas[0].geometry.coordinates[0][4]":
        "the ring is not closed (the last position must repeat the first)",
    });

    const line = v1();
    line.protectedAreas[0].geometry.coordinates = [
      [
        [16.05, 62.3],
        [16.051, 62.3],
        [16.052, 62.3],
        [16.05, 62.3],
      ],
    ];
    expect(errorsOf(line)).toEqual({
      "protectedAreas[0].geometry.coordinates[0]": "the ring encloses no area (all corners on one line)",
    });
  });

  it("[PF3] swapped lon/lat positions get a hint", () => {
    const p = v1();
    p.protectedAreas[0].geometry.coordinates[0][1] = [62.3, 116.056];
    expect(errorsOf(p)["protectedAreas[0].geometry.coordinates[0][1][1]"]).toBe(
      "latitude 116.056 is outside [-90, 90] deg (GeoJSON positions are [lon, lat]; are they swapped?)",
    );
  });

  it("[PF4] unknown radar and target references are named, with what is known", () => {
    const p = v1();
    p.posts[0].radarModelId = "kalvori-x8";
    p.requirement.targetClassIds = ["small-drone", "bird"];
    expect(errorsOf(p)).toEqual({
      "posts[0].radarModelId": '"kalvori-x8" is not a model in radarModels ("kalvori-x9")',
      "requirement.targetClassIds[1]": '"bird" is not a target class ("small-drone", "fixed-wing")',
    });
    const both = v1();
    both.posts[1].radarModelId = "kalvori-x9";
    expect(errorsOf(both)).toEqual({ "posts[1]": "give radarModelId or an inline radarModel, not both" });
    const neither = v1();
    delete neither.posts[0].radarModelId;
    expect(errorsOf(neither)).toEqual({ "posts[0].radarModelId": "is required (or an inline radarModel)" });
  });

  it("[PF4] duplicate ids, class heights outside the analysis list, and min_height ≥ height are named", () => {
    const p = v1();
    p.posts[1].id = "north-mast";
    p.targetClasses[1].heightsAglM = [50, 75];
    p.analysis.targetHeightsM = [10, 50, 120, 50];
    p.terrain.buildings.features[0].properties.min_height = 8;
    expect(errorsOf(p)).toEqual({
      "posts[1].id": '"north-mast" is already used by posts[0]',
      "targetClasses[1].heightsAglM[1]": "75 m is not one of analysis.targetHeightsM (10, 50, 120, 50 m)",
      "analysis.targetHeightsM[3]": "50 m is listed twice (also analysis.targetHeightsM[1])",
      "terrain.buildings.features[0].properties.min_height": "8 m is not below height (8 m)",
    });
  });

  it("[PF4] sites beyond the UTM latitudes are refused at validation", () => {
    const p = v1();
    p.posts[0].position.latDeg = 85;
    expect(errorsOf(p)["posts[0].position.latDeg"]).toMatch(/^latitude 85 is beyond 84° N/);
  });

  it("[PF5] inline radar model errors carry the full path", () => {
    const p = v1();
    p.posts[1].radarModel.transmitter.peakPowerW = 0;
    expect(errorsOf(p)).toEqual({ "posts[1].radarModel.transmitter.peakPowerW": "must be > 0 W (got 0)" });
  });

  it("[PF6] parsePlan never throws on arbitrary values (fuzz)", () => {
    fc.assert(
      fc.property(fc.anything({ withNullPrototype: true, withBigInt: true, withDate: true }), (value) => {
        const r = parsePlan(value);
        expect(r.ok).toBe(false);
        if (!r.ok) expect(r.errors.length).toBeGreaterThan(0);
      }),
      { numRuns: 500 },
    );
  });

  it("[PF6] parsePlan never throws on a valid plan with one value replaced (fuzz), and every error names a path", () => {
    const base = v1();
    const paths = allPaths(base);
    fc.assert(
      fc.property(
        fc.nat({ max: paths.length - 1 }),
        fc.oneof(fc.anything(), fc.double(), fc.constantFrom(Number.NaN, -1, 0, 1e12, "", null, [], {})),
        (k, value) => {
          const doc = setPath(v1(), paths[k], value);
          const r = parsePlan(doc);
          if (!r.ok) {
            for (const e of r.errors) {
              // No internal exception was caught on the way: every error comes from a rule.
              expect(e.message).not.toMatch(/^cannot be read as a plan/);
              expect(e.path.length).toBeGreaterThan(0);
              expect(e.message.length).toBeGreaterThan(0);
            }
          }
        },
      ),
      { numRuns: 3000 },
    );
  });

  it("[PF6] parsePlan never modifies its input, valid or not", () => {
    const good = deepFreeze(v1());
    expect(parsePlan(good).ok).toBe(true);
    expect(good).toEqual(v1());
    const bad = v1();
    bad.posts[0].mastHeightM = 5200;
    deepFreeze(bad);
    const before = structuredClone(bad);
    expect(parsePlan(bad).ok).toBe(false);
    expect(bad).toEqual(before);
    const old = deepFreeze(v0());
    expect(parsePlan(old).ok).toBe(true);
    expect(old).toEqual(v0());
  });

  it("[PF6] values no JSON file holds (throwing getters, cycles) give errors, not exceptions", () => {
    const trap = v1();
    Object.defineProperty(trap, "site", {
      enumerable: true,
      get() {
        throw new Error("boom");
      },
    });
    const r = parsePlan(trap);
    expect(r.ok).toBe(false);
    const cyclic = v1();
    cyclic.site.self = cyclic;
    expect(parsePlan(cyclic).ok).toBe(false);
  });

  it("[PF7] a version-0 plan migrates to version 1 (km → m, lonLat → position, azimuthDeg → boresightAzDeg)", () => {
    const r = parsePlan(v0());
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.fromVersion).toBe(0);
    expect(r.plan.version).toBe(1);
    expect(r.plan.approachRingDepthM).toBe(1500);
    expect(r.plan.posts[0].position).toEqual({ lonDeg: 16.053, latDeg: 62.304 });
    expect(r.plan.posts[0].boresightAzDeg).toBe(20);
    expect(r.plan.posts[0]).not.toHaveProperty("lonLat");
    expect(r.plan.posts[0]).not.toHaveProperty("azimuthDeg");
  });

  it("[PF7] a broken version-0 field is named in version-0 terms", () => {
    const p = v0();
    p.approachRingKm = "far";
    p.posts[0].lonLat = [16];
    const m = migrateV0toV1(p);
    expect(m.ok ? [] : m.errors).toEqual([
      { path: "approachRingKm", message: 'must be a finite number in km (format version 0; got "far")' },
      { path: "posts[0].lonLat", message: "must be [lon, lat] (format version 0; got an array)" },
    ]);
  });

  it("[PF8] a newer version is refused with a clear message; a missing or odd version is named", () => {
    const p = v1();
    p.version = PLAN_VERSION + 1;
    expect(errorsOf(p).version).toMatch(
      new RegExp(`^this plan uses format version ${PLAN_VERSION + 1}, newer than this build of Picket reads`),
    );
    const q = v1();
    delete q.version;
    expect(errorsOf(q).version).toBe("is required (this build reads plan format versions 0 to 1)");
    const s = v1();
    s.version = "1";
    expect(errorsOf(s).version).toMatch(/^must be a whole number \(got "1"/);
    expect(migratePlan([]).ok).toBe(false);
  });

  it("[PF9] plan file text: a field error names the item it lies in, read from the file", () => {
    const p = v1();
    p.posts[1].mastHeightM = 5200;
    p.posts[0].name = "";
    const r = loadPlanFile(JSON.stringify(p));
    expect(r.ok ? [] : r.errors.map((e) => `${e.path}: ${e.message}`)).toEqual([
      "posts[0].name: must not be empty",
      `posts[1].mastHeightM: 5200 is above the 300 m limit (post ${JSON.stringify(p.posts[1].name)})`,
    ]);
  });

  it("[PF9] plan file text: syntax errors by line and column", () => {
    const broken = v1Text.replace('"approachRingDepthM": 1500,', '"approachRingDepthM": 1500');
    const r = loadPlanFile(broken);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const line = broken.split("\n").findIndex((l) => l.includes('"approachRingDepthM"')) + 2;
    expect(r.errors[0].message).toMatch(new RegExp(`^line ${line}, column 3: `));
    expect(loadPlanFile(v1Text).ok).toBe(true);
  });

  it("[PF10] the published JSON Schemas in docs/ match the zod schemas (regenerate: npx tsx scripts/export-plan-schema.ts)", () => {
    const docs = join(import.meta.dirname, "../../docs");
    expect(readFileSync(join(docs, "plan.schema.json"), "utf8")).toBe(jsonSchemaText(planJsonSchema()));
    expect(readFileSync(join(docs, "radar.schema.json"), "utf8")).toBe(jsonSchemaText(radarJsonSchema()));
    const plan = planJsonSchema() as { properties: Record<string, Record<string, unknown>> };
    expect(plan.properties.approachRingDepthM).toMatchObject({ minimum: 0, maximum: 50000, unit: "m" });
  });
});
