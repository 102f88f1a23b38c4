/**
 * End-to-end harness: builds the production bundle, serves it with `vite preview` on 127.0.0.1, and
 * drives Debian's Chromium headless through playwright-core. Without /usr/bin/chromium the suite is
 * skipped with a loud warning, unless PICKET_REQUIRE_BROWSER=1 (CI), where it fails.
 */
import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { type BrowserContext, chromium, type Page } from "playwright-core";

export const CHROMIUM_PATH = "/usr/bin/chromium";
export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
export const SHOTS_DIR = join(ROOT, "tests/e2e/__screenshots__");
export const ACTUAL_DIR = join(SHOTS_DIR, "actual");
const OUT_DIR = join(ROOT, "node_modules/.picket-e2e-dist");

/** Whether the browser suite runs; throws in CI when the browser is missing. */
export function browserAvailable(): boolean {
  if (existsSync(CHROMIUM_PATH)) return true;
  if (process.env.PICKET_REQUIRE_BROWSER === "1") {
    throw new Error(`PICKET_REQUIRE_BROWSER=1 but ${CHROMIUM_PATH} is missing: install Debian's chromium`);
  }
  console.warn(
    `\n*** SKIPPING the browser tests: ${CHROMIUM_PATH} is missing (apt-get install chromium) ***\n`,
  );
  return false;
}

export interface Harness {
  baseUrl: string;
  context: BrowserContext;
  page: Page;
  userDataDir: string;
  errors: string[];
  requests: string[];
  stop(): Promise<void>;
}

function vite(args: string[]): ReturnType<typeof spawnSync> {
  return spawnSync(process.execPath, [join(ROOT, "node_modules/vite/bin/vite.js"), ...args], {
    cwd: ROOT,
    encoding: "utf8",
    env: { ...process.env, NODE_ENV: "production" },
  });
}

/** Builds the production bundle into node_modules/.picket-e2e-dist/ (ignored by git and lint). */
export function buildApp(): void {
  const r = vite(["build", "--outDir", OUT_DIR, "--emptyOutDir", "--logLevel", "warn"]);
  if (r.status !== 0) throw new Error(`vite build failed:\n${r.stdout}\n${r.stderr}`);
}

async function startPreview(): Promise<{ proc: ChildProcess; baseUrl: string }> {
  const port = 4300 + Math.floor(Math.random() * 500);
  const proc = spawn(
    process.execPath,
    [
      join(ROOT, "node_modules/vite/bin/vite.js"),
      "preview",
      "--outDir",
      OUT_DIR,
      "--host",
      "127.0.0.1",
      "--port",
      String(port),
      "--strictPort",
    ],
    { cwd: ROOT, stdio: ["ignore", "pipe", "pipe"] },
  );
  const baseUrl = `http://127.0.0.1:${port}/`;
  const deadline = Date.now() + 30_000;
  let log = "";
  proc.stdout?.on("data", (d) => {
    log += String(d);
  });
  proc.stderr?.on("data", (d) => {
    log += String(d);
  });
  while (Date.now() < deadline) {
    if (proc.exitCode !== null) throw new Error(`vite preview exited: ${log}`);
    try {
      const res = await fetch(baseUrl);
      if (res.ok) return { proc, baseUrl };
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  proc.kill();
  throw new Error(`vite preview did not start within 30 s: ${log}`);
}

/** Builds, serves, launches Chromium with a new empty profile (--user-data-dir via a persistent context), opens one page. */
export async function startHarness(): Promise<Harness> {
  buildApp();
  const { proc, baseUrl } = await startPreview();
  const userDataDir = mkdtempSync(join(tmpdir(), "picket-e2e-"));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    viewport: { width: 1400, height: 900 },
    acceptDownloads: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--no-first-run",
    ],
  });
  const errors: string[] = [];
  const requests: string[] = [];
  context.on("request", (r) => requests.push(r.url()));
  const page = context.pages()[0] ?? (await context.newPage());
  page.on("pageerror", (e) => errors.push(String(e)));
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(m.text());
  });
  return {
    baseUrl,
    context,
    page,
    userDataDir,
    errors,
    requests,
    async stop() {
      await context.close().catch(() => undefined);
      proc.kill();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Saves a screenshot under __screenshots__/actual/NAME.png and returns its path. */
export async function shoot(page: Page, name: string): Promise<string> {
  mkdirSync(ACTUAL_DIR, { recursive: true });
  const path = join(ACTUAL_DIR, `${name}.png`);
  await page.screenshot({ path });
  return path;
}

/**
 * Compares a screenshot with the golden image __screenshots__/NAME.png in the browser (canvas pixels):
 * the fraction of pixels whose largest channel difference exceeds `channelTolerance`. With REGEN=1, or
 * when no golden exists yet, the golden is (re)written and 0 returned.
 */
export async function compareGolden(page: Page, name: string, actualPath: string, channelTolerance = 40) {
  const goldenPath = join(SHOTS_DIR, `${name}.png`);
  if (process.env.REGEN === "1" || !existsSync(goldenPath)) {
    writeFileSync(goldenPath, readFileSync(actualPath));
    return { differingFraction: 0, regenerated: true };
  }
  const a = readFileSync(actualPath).toString("base64");
  const g = readFileSync(goldenPath).toString("base64");
  const cmp = await page.context().newPage();
  try {
    const differingFraction = await cmp.evaluate(
      async ({ a, g, tol }) => {
        const load = async (b64: string) => {
          const img = new Image();
          img.src = `data:image/png;base64,${b64}`;
          await img.decode();
          const c = document.createElement("canvas");
          c.width = img.width;
          c.height = img.height;
          const ctx = c.getContext("2d") as CanvasRenderingContext2D;
          ctx.drawImage(img, 0, 0);
          return ctx.getImageData(0, 0, c.width, c.height);
        };
        const [ia, ig] = await Promise.all([load(a), load(g)]);
        if (ia.width !== ig.width || ia.height !== ig.height) return 1;
        let bad = 0;
        for (let i = 0; i < ia.data.length; i += 4) {
          const d = Math.max(
            Math.abs(ia.data[i] - ig.data[i]),
            Math.abs(ia.data[i + 1] - ig.data[i + 1]),
            Math.abs(ia.data[i + 2] - ig.data[i + 2]),
          );
          if (d > tol) bad++;
        }
        return bad / (ia.width * ia.height);
      },
      { a, g, tol: channelTolerance },
    );
    return { differingFraction, regenerated: false };
  } finally {
    await cmp.close();
  }
}
