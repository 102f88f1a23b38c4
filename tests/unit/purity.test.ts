import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

// DESIGN.md "Code layout": src/coverage is the pure model. This test backs up the biome rule
// (biome.json overrides) so that `npm test` alone also catches a forbidden import.
const COVERAGE_DIR = join(import.meta.dirname, "../../src/coverage");
const FORBIDDEN = [
  /^react(-dom)?(\/|$)/,
  /^leaflet(\/|$)/,
  /^comlink(\/|$)/,
  /^@geoman-io\//,
  /^zustand/,
  /^zundo/,
  /^node:/,
  /(^|\/)\.\.\/(ui|map|workers|io|cli|report)(\/|$)/,
];

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return sourceFiles(path);
    return /\.tsx?$/.test(name) && !name.endsWith(".test.ts") ? [path] : [];
  });
}

function importsOf(text: string): string[] {
  const specs: string[] = [];
  for (const m of text.matchAll(
    /(?:import|export)[^'"]*?from\s*["']([^"']+)["']|import\(\s*["']([^"']+)["']\s*\)/g,
  )) {
    specs.push(m[1] ?? m[2]);
  }
  return specs;
}

describe("src/coverage purity", () => {
  const files = sourceFiles(COVERAGE_DIR);

  it("has source files to check", () => {
    expect(files.length).toBeGreaterThan(0);
  });

  it("imports no UI, map, worker, io or Node module", () => {
    const offences: string[] = [];
    for (const file of files) {
      for (const spec of importsOf(readFileSync(file, "utf8"))) {
        if (FORBIDDEN.some((re) => re.test(spec))) offences.push(`${file}: ${spec}`);
      }
    }
    expect(offences).toEqual([]);
  });

  it("the import scanner finds forbidden imports (self-check)", () => {
    const sample = 'import L from "leaflet";\nimport { x } from "../ui/panel";\nconst m = import("node:fs");';
    const found = importsOf(sample).filter((s) => FORBIDDEN.some((re) => re.test(s)));
    expect(found).toEqual(["leaflet", "../ui/panel", "node:fs"]);
  });
});
