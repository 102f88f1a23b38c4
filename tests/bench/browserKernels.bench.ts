/**
 * The same kernels in Node and in Chromium (page and dedicated worker), to tell how much of the
 * planner's slower runs in the browser is the browser's JavaScript engine and how much the page and
 * the second worker sharing two cores: fast and accurate sweeps and the radar stage on a synthetic
 * site, ns per cell, medians and spreads printed, never asserted. One thread runs at a time, so no
 * environment competes with another. Needs Debian's Chromium; esbuild bundles the kernels.
 * Run alone: npx tsx tests/bench/browserKernels.bench.ts [side] [runs]
 */
import { build, type Plugin } from "esbuild";
import { chromium } from "playwright-core";
import { browserAvailable, CHROMIUM_PATH } from "../e2e/harness.ts";
import { demoRadar } from "../unit/coverageFixtures.ts";
import { type KernelRequest, type KernelTimes, runKernels } from "./browserKernelsEntry.ts";
import { spread } from "./stats.ts";

/** coverageFixtures.ts reads demo models with node:fs (never called in the browser): a stand-in. */
const noNodeFs: Plugin = {
  name: "no-node-fs",
  setup(b) {
    b.onResolve({ filter: /^node:fs$/ }, () => ({ path: "node:fs", namespace: "stub" }));
    b.onLoad({ filter: /.*/, namespace: "stub" }, () => ({
      contents: "export function readFileSync() { throw new Error('no file system in the browser'); }",
    }));
  },
};

async function bundle(): Promise<string> {
  const r = await build({
    entryPoints: [new URL("./browserKernelsEntry.ts", import.meta.url).pathname],
    bundle: true,
    write: false,
    format: "iife",
    platform: "browser",
    target: "es2022",
    plugins: [noNodeFs],
    logLevel: "error",
  });
  return r.outputFiles[0].text;
}

export async function run(side = 1024, runs = 7): Promise<void> {
  if (!browserAvailable()) return;
  const req: KernelRequest = {
    rotating: demoRadar("kalvori-x9"),
    staring: demoRadar("mossbee-58"),
    side,
    runs,
  };
  const code = await bundle();
  const browser = await chromium.launch({
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--no-first-run"],
  });
  try {
    const page = await browser.newPage();
    await page.setContent("<!doctype html><title>kernels</title>");
    const results: Record<string, KernelTimes> = {};
    results.Node = runKernels(req);
    results["Chromium worker"] = await page.evaluate(
      ({ code, req }) =>
        new Promise<KernelTimes>((resolve, reject) => {
          const url = URL.createObjectURL(new Blob([code], { type: "text/javascript" }));
          const w = new Worker(url);
          w.onmessage = (e) => resolve(e.data as KernelTimes);
          w.onerror = (e) => reject(new Error(e.message));
          w.postMessage(req);
        }),
      { code, req },
    );
    await page.addScriptTag({ content: code });
    results["Chromium page"] = await page.evaluate(
      (req) => (globalThis as unknown as { picketKernels: typeof runKernels }).picketKernels(req),
      req,
    );
    console.log(`kernels on ${side} × ${side} cells, ${runs} runs each after a warm-up, ns per cell:`);
    for (const kernel of Object.keys(results.Node)) {
      const node = spread(results.Node[kernel]).median;
      const cols = Object.entries(results).map(([where, t]) => {
        const s = spread(t[kernel]);
        const ratio = where === "Node" ? "" : `, ${(s.median / node).toFixed(2)}× Node`;
        return `${where} ${s.median.toFixed(1)} (${s.min.toFixed(1)}–${s.max.toFixed(1)}${ratio})`;
      });
      console.log(`  ${kernel}: ${cols.join("; ")}`);
    }
  } finally {
    await browser.close();
  }
}

if (process.argv[1]?.endsWith("browserKernels.bench.ts"))
  await run(Number(process.argv[2] ?? 1024), Number(process.argv[3] ?? 7));
