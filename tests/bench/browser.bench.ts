/**
 * Browser responsiveness of the planner (prints, never asserts): the production build in headless
 * Chromium on the demo site scaled to about 1 million cells with 8 radars and 3 heights.
 *   - drag preview: coverage updates shown per second while a post is dragged (fast masking);
 *   - release: time from releasing the post to the accurate layers and summary;
 *   - main thread: long tasks (> 50 ms) observed during the drag.
 * Then the same plan at about 16 million cells (refused or timed, as the engine decides).
 * Run: npx tsx tests/bench/browser.bench.ts (PICKET_BENCH_DRAG_STEP_MS=100 moves the pointer 10 times a
 * second; PICKET_BENCH_CELLS=1e6 runs one grid size only; PICKET_BENCH_DRAGS=n drags n times, default 4;
 * PICKET_BENCH_REST_MS=ms rests the pointer that long before the release (default 0);
 * PICKET_BENCH_TRACE=DIR writes a Chrome trace of each release, page and workers, to DIR/release-N.json
 * for chrome://tracing or the DevTools performance panel; PICKET_BENCH_TRACE_JS=1 adds JavaScript samples)
 */
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { CDPSession, Page } from "playwright-core";
import type { Plan } from "../../src/io/planSchema";
import { siteGridFrame } from "../../src/io/siteGrid";
import { browserAvailable, startHarness } from "../e2e/harness";
import { scaledRidgePlan } from "./demoPlan";

const DRAG_STEPS = 30;
/** Drags of the post per grid size (back and forth): the first after opening also fills the caches. */
const DRAGS = Number(process.env.PICKET_BENCH_DRAGS ?? 4);
/** Pointer moves every this many ms: 16 ms is a 60 Hz pointer, as mice and touchpads report. */
const DRAG_STEP_MS = Number(process.env.PICKET_BENCH_DRAG_STEP_MS ?? 16);
/**
 * The pointer rests this long at the end of a drag before the button is released, ms (0: released at
 * once after the last move, the case the targets are measured in; a person placing a post pauses).
 */
const REST_MS = Number(process.env.PICKET_BENCH_REST_MS ?? 0);
/** Where the traces of the releases go (unset: none taken; tracing slows the page a little). */
const TRACE_DIR = process.env.PICKET_BENCH_TRACE;
/** Set: each trace starts at the press of the pointer and covers the whole drag, not the release only. */
const TRACE_DRAG = Boolean(process.env.PICKET_BENCH_TRACE_DRAG);

/** Starts a Chrome trace of the page and its workers (CDP Tracing: main thread, workers, V8). */
async function startTrace(page: Page): Promise<CDPSession> {
  const cdp = await page.context().newCDPSession(page);
  await cdp.send("Tracing.start", {
    transferMode: "ReturnAsStream",
    traceConfig: {
      includedCategories: [
        "devtools.timeline",
        "disabled-by-default-devtools.timeline",
        "v8.execute",
        "toplevel",
        // JavaScript samples of every thread: names the functions, but slows the page about 1.5×.
        ...(process.env.PICKET_BENCH_TRACE_JS ? ["disabled-by-default-v8.cpu_profiler"] : []),
      ],
    },
  });
  return cdp;
}

/** Ends the trace and writes it to `file` as JSON. */
async function endTrace(cdp: CDPSession, file: string): Promise<void> {
  const done = new Promise<string>((resolve) =>
    cdp.once("Tracing.tracingComplete", (e) => resolve(e.stream ?? "")),
  );
  await cdp.send("Tracing.end");
  const handle = await done;
  let text = "";
  for (;;) {
    const chunk = await cdp.send("IO.read", { handle });
    text += chunk.base64Encoded ? Buffer.from(chunk.data, "base64").toString("utf8") : chunk.data;
    if (chunk.eof) break;
  }
  await cdp.send("IO.close", { handle });
  await cdp.detach();
  writeFileSync(file, text);
}

function scaledPlan(targetCells: number): Plan {
  const plan = scaledRidgePlan(targetCells);
  plan.site = { ...plan.site, name: `${plan.site.name} at ${(targetCells / 1e6).toFixed(0)} M cells` };
  return plan;
}

async function status(page: Page): Promise<string> {
  return (await page.getByTestId("run-status").textContent()) ?? "";
}

async function generation(page: Page): Promise<number> {
  return Number(
    (await page
      .getByTestId("summary")
      .getAttribute("data-generation")
      .catch(() => "0")) ?? 0,
  );
}

async function openPlan(page: Page, plan: Plan, dir: string): Promise<number> {
  const file = join(dir, `bench-${plan.analysis.cellSizeM}.json`);
  writeFileSync(file, JSON.stringify(plan));
  const before = await generation(page);
  const t0 = Date.now();
  await page.getByTestId("import-input").setInputFiles(file);
  await page.waitForFunction(
    ({ name, before }) => {
      const st = document.querySelector('[data-testid="run-status"]')?.textContent ?? "";
      const gen = Number(
        document.querySelector('[data-testid="summary"]')?.getAttribute("data-generation") ?? 0,
      );
      return (
        document.querySelector('[data-testid="site-name"]')?.textContent === name &&
        !/Computing/.test(st) &&
        (/Not computed/.test(st) || gen > before)
      );
    },
    { name: plan.site.name, before },
    { timeout: 300_000 },
  );
  return Date.now() - t0;
}

/** The enabled ground post nearest the middle of the protected area (moving it keeps the grid frame). */
function groundPostName(plan: Plan): string {
  const ring =
    plan.protectedAreas[0].geometry.type === "Polygon"
      ? plan.protectedAreas[0].geometry.coordinates[0]
      : plan.protectedAreas[0].geometry.coordinates[0][0];
  const lon = ring.reduce((a, p) => a + p[0], 0) / ring.length;
  const lat = ring.reduce((a, p) => a + p[1], 0) / ring.length;
  const posts = plan.posts.filter((p) => p.enabled && p.mounting === "ground");
  posts.sort(
    (a, b) =>
      Math.hypot(a.position.lonDeg - lon, a.position.latDeg - lat) -
      Math.hypot(b.position.lonDeg - lon, b.position.latDeg - lat),
  );
  return posts[0].name;
}

/**
 * Drags the post by DRAG_STEPS small moves, `direction` 1 to the east and -1 back west (so two drags
 * return it near its start and the grid frame, which the posts' positions bound, stays the same).
 */
async function dragOnce(page: Page, postName: string, direction: 1 | -1, traceFile?: string) {
  await page.evaluate(() => {
    const w = window as unknown as {
      __long: { ms: number; at: number }[];
      __gens: number[];
      __accurate: number[];
      __complete: number[];
      __stop?: () => void;
    };
    w.__stop?.();
    w.__long = [];
    w.__gens = [];
    w.__accurate = [];
    w.__complete = [];
    const po = new PerformanceObserver((l) => {
      for (const e of l.getEntries()) w.__long.push({ ms: e.duration, at: e.startTime });
    });
    po.observe({ type: "longtask", buffered: false });
    const s = document.querySelector('[data-testid="summary"]');
    // Each change of the shown generation is one coverage update on screen; record when it happened.
    const mo = new MutationObserver(() => {
      const t = performance.now();
      w.__gens.push(t);
      const summary = document.querySelector('[data-testid="summary"]');
      if (summary?.getAttribute("data-mask-mode") === "accurate") {
        w.__accurate.push(t);
        if (summary.getAttribute("data-partial") !== "true") w.__complete.push(t);
      }
    });
    mo.observe(s?.parentElement ?? document.body, {
      attributes: true,
      subtree: true,
      // A release shows the shown slice (data-partial) and then every slice under the same generation.
      attributeFilter: ["data-generation", "data-partial"],
    });
    w.__stop = () => {
      po.disconnect();
      mo.disconnect();
    };
  });
  await page.getByTestId("tab-posts").click();
  // Select it in the list: the selected post always carries its name label on the map.
  await page.getByTestId("post-list").getByRole("button", { name: postName }).click();
  const marker = page.locator(".post-mark", { hasText: postName }).first();
  const b = await marker.boundingBox();
  if (!b) throw new Error("no post on screen");
  const x0 = b.x + b.width / 2;
  const y0 = b.y + b.height / 2;
  await page.mouse.move(x0, y0);
  const dragTrace = traceFile && TRACE_DRAG ? await startTrace(page) : null;
  const tDown = await page.evaluate(() => performance.now());
  await page.mouse.down();
  const tDrag = Date.now();
  for (let k = 1; k <= DRAG_STEPS; k++) {
    await page.mouse.move(x0 + direction * k * 3, y0 + Math.sin(k / 3) * 20);
    await page.waitForTimeout(DRAG_STEP_MS);
  }
  const dragS = (Date.now() - tDrag) / 1000;
  if (REST_MS > 0) await page.waitForTimeout(REST_MS);
  const updates = await page.evaluate(() => (window as unknown as { __gens: number[] }).__gens.length);
  const trace = dragTrace ?? (traceFile ? await startTrace(page) : null);
  const tUp = await page.evaluate(() => performance.now());
  await page.mouse.up();
  await page.waitForFunction(
    (t) => {
      const s = document.querySelector('[data-testid="summary"]');
      const st = document.querySelector('[data-testid="run-status"]')?.textContent ?? "";
      return (
        s?.getAttribute("data-mask-mode") === "accurate" &&
        !/Computing/.test(st) &&
        (window as unknown as { __complete: number[] }).__complete.some((g) => g > t)
      );
    },
    tUp,
    { timeout: 120_000 },
  );
  if (trace && traceFile) await endTrace(trace, traceFile);
  // The shown slice lands first (accurate), the other slices a moment later.
  const [firstMs, releaseMs] = await page.evaluate((t) => {
    const w = window as unknown as { __accurate: number[]; __complete: number[] };
    // No named helper here: the bundler would wrap it in a function the page does not have.
    return [w.__accurate, w.__complete].map((xs) => Math.min(...xs.filter((g) => g > t)) - t);
  }, tUp);
  // Each long task with its start relative to the release, ms (negative: during the drag).
  const long = await page.evaluate(
    () => (window as unknown as { __long: { ms: number; at: number }[] }).__long,
  );
  const longTasks = long.map((t) => ({ ms: t.ms, fromReleaseMs: t.at - tUp }));
  const pressedMs = tDown - tUp;
  const workerMs = Number((await status(page)).match(/Computed in (\d+)/)?.[1] ?? Number.NaN);
  const computedRadars = await page.getByTestId("summary").getAttribute("data-computed-radars");
  return {
    updatesPerS: updates / dragS,
    firstMs,
    releaseMs,
    longTasks,
    pressedMs,
    workerMs,
    computedRadars,
  };
}

/**
 * Share of the coverage layer's tile pixels that are painted (not transparent): the bench times what
 * lands on the page, and this says the map really drew it.
 */
async function paintedShare(page: Page): Promise<number> {
  return page.evaluate(() => {
    let painted = 0;
    let all = 0;
    for (const c of document.querySelectorAll<HTMLCanvasElement>(".leaflet-picket-coverage-pane canvas")) {
      const data = c.getContext("2d")?.getImageData(0, 0, c.width, c.height).data;
      if (!data) continue;
      for (let i = 3; i < data.length; i += 4) if (data[i] > 0) painted++;
      all += data.length / 4;
    }
    return all > 0 ? painted / all : 0;
  });
}

async function main() {
  if (!browserAvailable()) return;
  const dir = mkdtempSync(join(tmpdir(), "picket-bench-"));
  const h = await startHarness();
  try {
    const page = h.page;
    await page.goto(h.baseUrl);
    await page.waitForFunction(
      () => /Computed in/.test(document.querySelector('[data-testid="run-status"]')?.textContent ?? ""),
      null,
      {
        timeout: 120_000,
      },
    );
    const hint = page.getByTestId("hint-dismiss");
    if (await hint.count()) await hint.click();
    console.log(
      `cores (navigator.hardwareConcurrency): ${await page.evaluate(() => navigator.hardwareConcurrency)}; pointer moves every ${DRAG_STEP_MS} ms`,
    );
    const sizes = process.env.PICKET_BENCH_CELLS ? [Number(process.env.PICKET_BENCH_CELLS)] : [1e6, 16e6];
    for (const cells of sizes) {
      const plan = scaledPlan(cells);
      const g = siteGridFrame(plan);
      const openMs = await openPlan(page, plan, dir);
      const st = await status(page);
      console.log(
        `\n${(g.cellCount / 1e6).toFixed(2)} M cells (${g.frame.width} × ${g.frame.height} of ${plan.analysis.cellSizeM} m), 8 radars, ${plan.analysis.targetHeightsM.length} heights`,
      );
      console.log(`  open and first accurate run: ${openMs} ms wall (${st.trim()})`);
      if (!/Computed in/.test(st)) continue;
      const name = groundPostName(plan);
      for (let run = 1; run <= DRAGS; run++) {
        const traceFile = TRACE_DIR ? join(TRACE_DIR, `release-${run}.json`) : undefined;
        const d = await dragOnce(page, name, run % 2 === 1 ? 1 : -1, traceFile);
        if (traceFile) console.log(`    trace of the release: ${traceFile}`);
        const over = d.longTasks.filter((t) => t.ms > 50);
        console.log(
          `  drag ${run} of "${name}": preview ${d.updatesPerS.toFixed(1)} updates/s (target ≥ 10 on 1 M cells)`,
        );
        console.log(
          `    release → accurate layers of the shown slice: ${d.firstMs.toFixed(0)} ms; all slices and summary: ${d.releaseMs.toFixed(0)} ms, of which the worker ${d.workerMs} ms computing ${d.computedRadars ?? "?"} radar(s) (target < 150 ms on 1 M cells, < 1 s on 16 M)`,
        );
        for (const m of await page.getByTestId("message-error").allTextContents())
          console.log(`    message shown: ${m}`);
        const when = over.map(
          (t) =>
            `${t.ms.toFixed(0)} ms at ${t.fromReleaseMs >= 0 ? "+" : ""}${t.fromReleaseMs.toFixed(0)} ms`,
        );
        console.log(
          `    main-thread long tasks during the drag and release: ${over.length} over 50 ms${over.length ? ` (${when.join(", ")} from the release; pointer pressed at ${d.pressedMs.toFixed(0)} ms)` : ""}`,
        );
      }
      // After the last release's repaints (a few frames).
      await page.waitForTimeout(500);
      const share = await paintedShare(page);
      console.log(
        `  coverage tiles painted: ${(100 * share).toFixed(1)} % of their pixels${share === 0 ? " — NOTHING DRAWN: the figures above time an empty map" : ""}`,
      );
    }
  } finally {
    await h.stop();
  }
}

/** Entry for `npm run bench` (tests/bench/run.ts), which awaits it after the other benchmarks. */
export async function run(): Promise<void> {
  await main();
}

// Run alone: `npx tsx tests/bench/browser.bench.ts`.
if (process.argv[1]?.endsWith("browser.bench.ts")) {
  main().catch((e) => {
    console.error(e);
    process.exitCode = 1;
  });
}
