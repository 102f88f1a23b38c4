import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import {
  exposureCommand,
  horizonCommand,
  pdCommand,
  rangeCommand,
  snrCommand,
} from "../../src/cli/calcCommands.ts";
import { sumOfTermsDb } from "../../src/coverage/linkBudget.ts";
import { loadRadarModelFile } from "../../src/io/radarFile.ts";

const ROOT = join(import.meta.dirname, "../..");
const RADARS = join(ROOT, "demo-sites/radars");

function radar(file: string) {
  const r = loadRadarModelFile(readFileSync(join(RADARS, file), "utf8"));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.model;
}

/** Runs the real command line, as a user would. */
function calc(...args: string[]) {
  const tsx = join(ROOT, "node_modules/.bin/tsx");
  const r = spawnSync(tsx, [join(ROOT, "src/cli/calc.ts"), ...args], { encoding: "utf8", cwd: ROOT });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("calc subcommands (in process)", () => {
  it("pd: 13.2 dB steady target at Pfa 1e-6 gives Pd ≈ 0.9 (detection-theory tables, from memory)", () => {
    const out = pdCommand({ snrDb: 13.2, pfa: 1e-6, looks: 1, swerling: 0 });
    expect(out.result.pd).toBeGreaterThan(0.89);
    expect(out.result.pd).toBeLessThan(0.91);
    expect(out.lines[0]).toMatch(/^Pd = 0\.9/);
  });

  it("snr: Swerling 1, Pd 0.9, Pfa 1e-6 needs ≈ 21.1 dB (closed form Pd = Pfa^(1/(1+SNR)))", () => {
    const out = snrCommand({ pd: 0.9, pfa: 1e-6, looks: 1, swerling: 1 });
    const closedFormDb = 10 * Math.log10(Math.log(1e-6) / Math.log(0.9) - 1);
    expect(out.result.requiredSnrDb).toBeCloseTo(closedFormDb, 3);
  });

  it("range: the budget at the detection range sums to the required SNR", () => {
    const out = rangeCommand({
      radar: radar("kalvori-x9-rotating-pulsed.json"),
      rcsDbsm: -20,
      pd: 0.9,
      pfa: 1e-6,
      looks: 1,
      swerling: 1,
    });
    expect(out.result.freeSpaceRangeM).toBeGreaterThan(100);
    expect(out.result.budget.snrDb).toBeCloseTo(out.result.requiredSnrDb, 6);
    expect(sumOfTermsDb(out.result.budget)).toBeCloseTo(out.result.requiredSnrDb, 6);
    expect(out.result.detectionRangeM).toBeLessThanOrEqual(out.result.instrumentedRangeM);
    expect(out.lines.join("\n")).toMatch(/Range to the fourth R⁴/);
  });

  it("horizon: 10 m mast, 50 m target over a 4/3 Earth ≈ 4.12(√10 + √50) km (handbook formula, common practice)", () => {
    const out = horizonCommand({ mastM: 10, targetM: 50, k: 4 / 3 });
    expect(out.result.horizonM / 1000).toBeCloseTo(4.12 * (Math.sqrt(10) + Math.sqrt(50)), 0);
  });

  it("exposure: four compliance rows per case and the cautions", () => {
    const out = exposureCommand(radar("kalvori-x9-rotating-pulsed.json"));
    expect(out.result.stopped).toHaveLength(4);
    expect(out.result.stopped.every((r) => r.distanceM > 0)).toBe(true);
    // Scanning spreads the beam over the circle, so people can stand closer than with the antenna stopped.
    expect(out.result.scanning[0].distanceM).toBeLessThan(out.result.stopped[0].distanceM);
    expect(out.lines.join("\n")).toMatch(/spectrum authorisation/);
  });
});

describe("calc command line", () => {
  it("prints JSON with --json", () => {
    const r = calc("snr", "--pd", "0.9", "--pfa", "1e-6", "--json");
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).requiredSnrDb).toBeCloseTo(13.18, 1);
  });

  it("names the flag of a bad value and exits with 2", () => {
    const r = calc("pd", "--snr-db", "12", "--pfa", "2");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--pfa: 2 must be < 1/);
  });

  it("names the radar file's bad field", () => {
    const r = calc("exposure", "--radar", join(ROOT, "package.json"));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--radar: .* is not a valid radar model/);
  });

  it("refuses a 5 km mast by flag name", () => {
    const r = calc("horizon", "--mast-m", "5000", "--target-m", "10");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--mast-m: 5000 m must be ≤ 300 m/);
  });
});
