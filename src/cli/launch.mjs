// Starts a command-line entry (src/cli/<name>.ts) from a JavaScript bundle that esbuild makes on
// first use and again whenever a source file changes, kept in node_modules/.cache/picket-cli/. A
// bundle starts in about 0.2 s where compiling the TypeScript on the fly (tsx) takes 1.5 s, which
// matters for `plan los` in GIS scripts. Without esbuild the TypeScript runs through tsx as before.
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..", "..");
const cacheDir = join(root, "node_modules", ".cache", "picket-cli");
const KEEP_BUNDLES = 3;
const FALLBACK_CODES = new Set(["ERR_MODULE_NOT_FOUND", "EACCES", "EPERM", "EROFS"]);

/** A key of every source file's path, size and modification time, and of the lockfile. */
function sourceKey() {
  const hash = createHash("sha1");
  const walk = (dir) => {
    for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) =>
      a.name < b.name ? -1 : 1,
    )) {
      const path = join(dir, entry.name);
      if (entry.isDirectory()) walk(path);
      else if (/\.(ts|mts|mjs|json)$/.test(entry.name)) {
        const s = statSync(path);
        hash.update(`${path}:${s.size}:${s.mtimeMs}\n`);
      }
    }
  };
  walk(join(root, "src"));
  const lock = join(root, "package-lock.json");
  if (existsSync(lock)) hash.update(`lock:${statSync(lock).mtimeMs}`);
  return hash.digest("hex").slice(0, 16);
}

/** Bundle every entry into a fresh folder, then move it into place (safe against a parallel run). */
async function buildBundle(dir) {
  const { build } = await import("esbuild");
  const tmp = `${dir}.tmp-${process.pid}`;
  rmSync(tmp, { recursive: true, force: true });
  await build({
    entryPoints: { calc: join(root, "src/cli/calc.ts"), plan: join(root, "src/cli/plan.ts") },
    outdir: tmp,
    outExtension: { ".js": ".mjs" },
    bundle: true,
    splitting: true,
    format: "esm",
    platform: "node",
    target: "node20",
    logLevel: "error",
    // Bundled CommonJS dependencies call require(); give the ES module one.
    banner: {
      js: 'import { createRequire as __picketRequire } from "node:module"; const require = __picketRequire(import.meta.url);',
    },
  });
  writeFileSync(join(tmp, "complete"), "");
  try {
    renameSync(tmp, dir);
  } catch {
    rmSync(tmp, { recursive: true, force: true }); // another run moved the same bundle in first
  }
  for (const old of readdirSync(cacheDir)
    .map((name) => ({ name, t: statSync(join(cacheDir, name)).mtimeMs }))
    .sort((a, b) => b.t - a.t)
    .slice(KEEP_BUNDLES)) {
    rmSync(join(cacheDir, old.name), { recursive: true, force: true });
  }
}

/** The module of entry `name` ("calc" or "plan"): from the bundle, else from TypeScript via tsx. */
export async function loadEntry(name) {
  const dir = join(cacheDir, sourceKey());
  if (!existsSync(join(dir, "complete"))) {
    try {
      mkdirSync(cacheDir, { recursive: true });
      await buildBundle(dir);
    } catch (e) {
      // No esbuild, or a cache folder that cannot be written (a read-only install): run the TypeScript.
      if (!FALLBACK_CODES.has(e?.code)) throw e;
      const { register } = await import("tsx/esm/api");
      register();
      return import(pathToFileURL(join(root, "src/cli", `${name}.ts`)).href);
    }
  }
  return import(pathToFileURL(join(dir, `${name}.mjs`)).href);
}
