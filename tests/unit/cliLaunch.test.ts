/**
 * The installed entries (`picket-plan`, `picket-calc`, `npm run plan|calc`) start the commands from
 * the esbuild bundle that src/cli/launch.mjs keeps: run as child processes, they give the same
 * answers and exit statuses as the TypeScript commands, and a changed source makes a new bundle.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

function run(bin: string, args: string[]): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [`src/cli/${bin}`, ...args], { encoding: "utf8", timeout: 60_000 });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

describe("command-line entries from the bundle", () => {
  it("picket-calc computes Pd and names a bad flag with exit status 2", () => {
    const ok = run("calc-bin.mjs", ["pd", "--snr-db", "13.18", "--pfa", "1e-6"]);
    expect(ok.code).toBe(0);
    // Steady target, Pfa 1e-6: 13.18 dB is the required SNR for Pd 0.9 rounded to 0.01 dB (checked
    // against scipy in tests/reference), so Pd comes out just under 0.9.
    expect(ok.out).toMatch(/Pd = 0\.899/);
    const bad = run("calc-bin.mjs", ["pd", "--snr-db", "x", "--pfa", "1e-6"]);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--snr-db/);
    const cache = join("node_modules", ".cache", "picket-cli");
    expect(readdirSync(cache).some((d) => !d.includes(".tmp-"))).toBe(true);
  }, 90_000);

  it("picket-plan los writes a raster, and refuses a missing DEM with exit status 2", () => {
    const dir = mkdtempSync(join(tmpdir(), "picket-launch-"));
    const out = join(dir, "los.tif");
    const ok = run("plan-bin.mjs", [
      "los",
      "--dem",
      "demo-sites/ridge-waterworks/terrain.tif",
      "--at",
      "-25.9,133.4",
      "--mast-m",
      "12",
      "--mode",
      "fast",
      "--out",
      out,
    ]);
    expect(ok.err).toBe("");
    expect(ok.code).toBe(0);
    expect(ok.out).toMatch(/^wrote .*los\.tif \(\d+ × \d+, fast masking/);
    const bad = run("plan-bin.mjs", [
      "los",
      "--dem",
      join(dir, "none.tif"),
      "--at-xy",
      "1,2",
      "--mast-m",
      "5",
      "--out",
      out,
    ]);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--dem/);
  }, 90_000);
});
