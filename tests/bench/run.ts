/**
 * `npm run bench`: runs every tests/bench/*.bench.ts module's `run()` in turn (alphabetical), the
 * coverage benchmark last. Timings are printed, never asserted; not part of `npm test`.
 */
import { readdirSync } from "node:fs";
import { fileURLToPath } from "node:url";

const dir = fileURLToPath(new URL(".", import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(dir)
  .filter((f) => f.endsWith(".bench.ts") && f !== "coverage.bench.ts")
  .sort();
files.push("coverage.bench.ts");
for (const f of files) {
  if (only.length > 0 && !only.some((o) => f.startsWith(o))) continue;
  console.log(`\n== ${f}`);
  const mod = (await import(new URL(f, import.meta.url).href)) as { run?: () => Promise<void> | void };
  if (typeof mod.run !== "function") {
    console.log(`${f}: no run() exported, skipped`);
    continue;
  }
  const t = performance.now();
  await mod.run();
  console.log(`(${f}: ${((performance.now() - t) / 1000).toFixed(1)} s)`);
}
