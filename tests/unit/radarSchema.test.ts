import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { locateJsonError, parseJsonText } from "../../src/io/jsonText.ts";
import { loadRadarModelFile } from "../../src/io/radarFile.ts";
import { parseRadarModel } from "../../src/io/radarSchema.ts";

const RADAR_DIR = join(import.meta.dirname, "../../demo-sites/radars");
const radarFiles = readdirSync(RADAR_DIR).filter((f) => f.endsWith(".json"));

function example(): Record<string, unknown> {
  return JSON.parse(readFileSync(join(RADAR_DIR, "mossbee-58-patch-fmcw.json"), "utf8"));
}

describe("radar model files", () => {
  it("[RM1] the three invented example radars validate and are marked invented", () => {
    expect(radarFiles.length).toBeGreaterThanOrEqual(3);
    for (const f of radarFiles) {
      const r = loadRadarModelFile(readFileSync(join(RADAR_DIR, f), "utf8"));
      if (!r.ok) throw new Error(`${f}: ${JSON.stringify(r.errors)}`);
      expect(r.model.invented).toBe(true);
      expect(r.model.name).toMatch(/invented/);
    }
  });

  it("[RM1] the examples cover the three classes asked for", () => {
    const models = radarFiles.map((f) => {
      const r = loadRadarModelFile(readFileSync(join(RADAR_DIR, f), "utf8"));
      if (!r.ok) throw new Error(f);
      return r.model;
    });
    const staring24 = models.find(
      (m) => m.scan.kind === "staring" && Math.abs(m.frequencyHz - 24.15e9) < 1e8,
    );
    expect(staring24?.waveform.kind).toBe("fmcw");
    const rotatingX = models.find((m) => m.scan.kind === "rotating");
    expect(rotatingX?.waveform.kind).toBe("pulsed");
    expect(rotatingX!.frequencyHz).toBeGreaterThanOrEqual(8e9);
    expect(rotatingX!.frequencyHz).toBeLessThanOrEqual(12e9);
    const patch58 = models.find((m) => Math.abs(m.frequencyHz - 5.8e9) < 1e8);
    expect(patch58?.rxAntenna).toBeDefined();
    // 4×4 transmit and 2×2 receive patch arrays: ~16 dBi and ~10.6 dBi (common practice).
    expect(patch58!.txAntenna.peakGainDbi - patch58!.rxAntenna!.peakGainDbi).toBeCloseTo(5.4, 1);
  });

  it("[RM2] a missing optional main-beam shape defaults to gaussian", () => {
    const m = example();
    delete (m.txAntenna as Record<string, unknown>).mainBeam;
    const r = parseRadarModel(m);
    expect(r.ok && r.model.txAntenna.mainBeam).toBe("gaussian");
  });

  it("[RM3] errors name the path and the rule", () => {
    const m = example();
    (m.transmitter as Record<string, unknown>).peakPowerW = -3;
    (m.txAntenna as Record<string, unknown>).azBeamwidthDeg = 400;
    (m.waveform as Record<string, unknown>).chirpsPerFrame = 2.5;
    m.frequencyHz = Number.NaN;
    const r = parseRadarModel(m);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const byPath = Object.fromEntries(r.errors.map((e) => [e.path, e.message]));
    expect(byPath["transmitter.peakPowerW"]).toBe("must be > 0 W (got -3)");
    expect(byPath["txAntenna.azBeamwidthDeg"]).toBe("400 is above the 360 deg limit");
    expect(byPath["waveform.chirpsPerFrame"]).toBe("must be a whole number (got 2.5)");
    expect(byPath.frequencyHz).toBe("must be a finite number in Hz (got NaN)");
  });

  it("[RM3] unknown fields, wrong kinds and cross-field rules are named", () => {
    const m = example();
    m.peakPowerW = 1;
    (m.scan as Record<string, unknown>).kind = "spinning";
    m.maxInstrumentedRangeM = 3;
    const r = parseRadarModel(m);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toContainEqual({ path: "peakPowerW", message: "unknown field" });
    expect(r.errors.find((e) => e.path === "scan.kind")?.message).toMatch(/staring/);

    const m2 = example();
    m2.maxInstrumentedRangeM = 3;
    const r2 = parseRadarModel(m2);
    expect(r2.ok ? [] : r2.errors).toEqual([
      { path: "maxInstrumentedRangeM", message: "3 m is not beyond the blind zone, blindZoneM (5 m)" },
    ]);

    const m3 = example();
    (m3.waveform as Record<string, unknown>).chirpPeriodS = 0.0005;
    const r3 = parseRadarModel(m3);
    expect(r3.ok ? [] : r3.errors[0].path).toBe("waveform.chirpPeriodS");
  });

  it("[RM3] a missing required field says it is required, with its unit", () => {
    const m = example();
    delete m.blindZoneM;
    const r = parseRadarModel(m);
    expect(r.ok ? [] : r.errors).toEqual([{ path: "blindZoneM", message: "is required (a number in m)" }]);
  });

  it("[RM4] JSON syntax errors are named with line and column", () => {
    const text = '{\n  "id": "a",\n  "name": "b",,\n}';
    const r = loadRadarModelFile(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors[0].path).toBe("(file)");
    expect(r.errors[0].message).toMatch(/^line 3, column 15: /);
    expect(locateJsonError('{"a": [1, 2,]}')).toMatchObject({ line: 1, column: 13 });
    expect(locateJsonError('{"a": tru}')).toMatchObject({ line: 1, column: 10 });
    expect(locateJsonError('{"a": 1}\n x')).toMatchObject({ line: 2, column: 2 });
    expect(locateJsonError("")).toMatchObject({ line: 1, column: 1 });
  });

  it("[RM4] the syntax scanner agrees with JSON.parse on arbitrary text (fuzz)", () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.json(),
          fc.string(),
          fc.json().map((j) => j.slice(0, -1)),
        ),
        (text) => {
          let parses = true;
          try {
            JSON.parse(text);
          } catch {
            parses = false;
          }
          expect(locateJsonError(text) === null).toBe(parses);
          expect(parseJsonText(text).ok).toBe(parses);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("[RM5] parseRadarModel never throws and never mutates its input (fuzz)", () => {
    fc.assert(
      fc.property(fc.anything(), (value) => {
        const r = parseRadarModel(value);
        expect(typeof r.ok).toBe("boolean");
      }),
      { numRuns: 1000 },
    );
    // One field of a valid model replaced by anything: named errors only, no internal exception.
    const leaves: string[][] = [];
    const walk = (v: unknown, path: string[]) => {
      leaves.push(path);
      if (typeof v === "object" && v !== null) for (const [k, x] of Object.entries(v)) walk(x, [...path, k]);
    };
    walk(example(), []);
    fc.assert(
      fc.property(fc.nat({ max: leaves.length - 1 }), fc.anything(), (k, value) => {
        const doc: Record<string, unknown> = example();
        const path = leaves[k];
        let target: Record<string, unknown> | unknown = doc;
        for (const key of path.slice(0, -1)) target = (target as Record<string, unknown>)[key];
        if (path.length > 0) (target as Record<string, unknown>)[path[path.length - 1]] = value;
        const r = parseRadarModel(path.length === 0 ? value : doc);
        if (!r.ok) for (const e of r.errors) expect(e.message).not.toMatch(/^cannot be read/);
      }),
      { numRuns: 1500 },
    );
    const m = example();
    delete (m.txAntenna as Record<string, unknown>).mainBeam;
    const before = structuredClone(m);
    parseRadarModel(m);
    expect(m).toEqual(before);
  });
});
