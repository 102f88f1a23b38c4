/**
 * End-to-end: the production build in headless Chromium, driven like a user would. One page goes
 * through the cases in order (each leaves the plan as the next expects). Screenshots are written to
 * __screenshots__/actual/; a few are compared with golden images (REGEN=1 rewrites them).
 */
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { evaluateSite } from "../../src/coverage/evaluate";
import { parsePlan } from "../../src/io/planValidation";
import { preparePlan } from "../../src/io/preparePlan";
import { squareGeometry } from "../dom/squareGeometry";
import { browserAvailable, compareGolden, type Harness, ROOT, shoot, startHarness } from "./harness";

const RUN = browserAvailable();
const DEMO = join(ROOT, "demo-sites/ridge-waterworks");
/** Share of pixels allowed to differ from a golden image (font hinting, antialiasing of vectors). */
const GOLDEN_TOLERANCE = 0.03;

let h: Harness;
let page: Page;
const work = mkdtempSync(join(tmpdir(), "picket-e2e-files-"));

async function waitComputed(p: Page): Promise<void> {
  await p.waitForFunction(
    () => /Computed in/.test(document.querySelector('[data-testid="run-status"]')?.textContent ?? ""),
    null,
    {
      timeout: 60_000,
    },
  );
}

/** The generation of the results on screen (the summary carries it). */
async function gen(p: Page): Promise<number> {
  const l = p.getByTestId("summary");
  if ((await l.count()) === 0) return 0;
  return Number((await l.getAttribute("data-generation")) ?? 0);
}

/** Waits for accurate results newer than generation `before`. */
async function waitNewRun(p: Page, before: number): Promise<void> {
  await p.waitForFunction(
    (b) => {
      const s = document.querySelector('[data-testid="summary"]');
      const st = document.querySelector('[data-testid="run-status"]')?.textContent ?? "";
      return (
        Number(s?.getAttribute("data-generation") ?? 0) > b &&
        s?.getAttribute("data-mask-mode") === "accurate" &&
        !/Computing/.test(st)
      );
    },
    before,
    { timeout: 25_000 },
  );
}

/** Text of the first element with the test id, "" when there is none (never waits). */
async function text(p: Page, testId: string): Promise<string> {
  const l = p.getByTestId(testId).first();
  if ((await l.count()) === 0) return "";
  return (await l.textContent({ timeout: 5_000 })) ?? "";
}

async function summaryFigures(p: Page): Promise<string> {
  return (await p.getByTestId("summary").textContent()) ?? "";
}

async function mapBox(p: Page) {
  const b = await p.getByTestId("map").boundingBox();
  if (!b) throw new Error("map not visible");
  return b;
}

/** Of the shown labels matching `selector`, how many there are and how many overlap a post's name. */
async function labelsOnPostNames(p: Page, selector: string): Promise<{ shown: number; clashes: number }> {
  return p.evaluate((sel) => {
    const rect = (e: Element) => e.getBoundingClientRect();
    const hit = (a: DOMRect, b: DOMRect) =>
      a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
    const names = Array.from(document.querySelectorAll(".post-label"), rect);
    const shown = Array.from(document.querySelectorAll(sel))
      .filter((e) => (e as HTMLElement).style.visibility !== "hidden")
      .map(rect);
    return { shown: shown.length, clashes: shown.filter((r) => names.some((q) => hit(r, q))).length };
  }, selector);
}

async function openTab(p: Page, id: string): Promise<void> {
  await p.getByTestId(`tab-${id}`).click();
}

describe.skipIf(!RUN)("planner in the browser", { timeout: 60_000 }, () => {
  beforeAll(async () => {
    h = await startHarness();
    page = h.page;
    // Use the download/file-input fallbacks of browser-fs-access, which playwright can drive.
    await h.context.addInitScript(() => {
      const w = window as unknown as Record<string, unknown>;
      delete w.showSaveFilePicker;
      delete w.showOpenFilePicker;
    });
  }, 240_000);

  afterAll(async () => {
    await h?.stop();
  });

  it("opens the demo site already evaluated, offline, with no errors", async () => {
    await page.goto(h.baseUrl);
    await waitComputed(page);
    await expect.poll(() => text(page, "site-name")).toMatch(/Ridge waterworks/);
    expect(await page.getByTestId("first-run-hint").isVisible()).toBe(true);
    await page.getByTestId("hint-dismiss").click();
    await page.waitForTimeout(800);
    const shot = await shoot(page, "demo-open");
    const g = await compareGolden(page, "demo-open", shot);
    expect(g.differingFraction).toBeLessThan(GOLDEN_TOLERANCE);
    const foreign = h.requests.filter(
      (u) => !u.startsWith(h.baseUrl) && !u.startsWith("data:") && !u.startsWith("blob:"),
    );
    expect(foreign).toEqual([]);
    expect(h.errors).toEqual([]);
    const csp = await page
      .locator('meta[http-equiv="Content-Security-Policy"]')
      .first()
      .getAttribute("content");
    expect(csp).toMatch(/script-src 'self'/);
    expect(csp).not.toMatch(/unsafe-eval/);
    // Gap area labels give way to post names: no shown label overlaps one, and some are shown.
    const clashes = await labelsOnPostNames(page, ".gap-label span");
    expect(clashes.shown).toBeGreaterThan(0);
    expect(clashes.clashes).toBe(0);
    // At 10 m the knoll mast alone meets cells no other post meets; the water tower meets none alone.
    const spare = await text(page, "posts-met-elsewhere");
    expect(spare).toMatch(/Water tower top/);
    expect(spare).not.toMatch(/North-west knoll mast/);
  });

  it("shows the same summary figures as the engine run in Node on the same plan", async () => {
    const json = JSON.parse(readFileSync(join(DEMO, "plan.json"), "utf8"));
    const parsed = parsePlan(json);
    if (!parsed.ok) throw new Error("demo plan does not parse");
    const bytes = readFileSync(join(DEMO, "terrain.tif"));
    const prepared = await preparePlan(parsed.plan, {
      fileName: "terrain.tif",
      data: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength),
    });
    const result = await evaluateSite(prepared.site);
    const first = result.targets[0];
    for (const hr of first.heights) {
      const m = hr.metrics;
      const pct = (f: number) => (Number.isFinite(f) ? `${(f * 100).toFixed(1)} %` : "—");
      expect(await text(page, `covered-protected-${hr.heightAglM}`)).toBe(
        pct(m.protectedArea.coveredFraction),
      );
      expect(await text(page, `covered-ring-${hr.heightAglM}`)).toBe(pct(m.approachRing.coveredFraction));
      expect(await text(page, `gap-count-${hr.heightAglM}`)).toBe(String(m.gaps.count));
    }
  });

  it("switches target heights at once", async () => {
    const before = await shoot(page, "height-10");
    const t0 = Date.now();
    await page.getByTestId("height-60").click();
    await expect.poll(() => page.getByTestId("height-60").getAttribute("aria-pressed")).toBe("true");
    const switchMs = Date.now() - t0;
    const after = await shoot(page, "height-60");
    expect(readFileSync(before).equals(readFileSync(after))).toBe(false);
    console.log(`height switch shown in ${switchMs} ms (no recomputation)`);
    await page.getByTestId("height-10").click();
  });

  it("configures the requirement, analysis and radar library with named errors", async () => {
    await openTab(page, "targets");
    const covered0 = await text(page, "covered-protected-10");
    const g0 = await gen(page);
    const pd = page.getByTestId("required-pd");
    // Every radar is computed again (the requirement is part of its key): the status shows how far.
    await page.evaluate(() => {
      const w = window as unknown as { __statuses: string[] };
      w.__statuses = [];
      const el = document.querySelector('[data-testid="run-status"]') as Element;
      new MutationObserver(() => w.__statuses.push(el.textContent ?? "")).observe(el, {
        childList: true,
        subtree: true,
        characterData: true,
      });
    });
    await pd.fill("0.5");
    await pd.press("Enter");
    await waitNewRun(page, g0);
    const statuses = await page.evaluate(() => (window as unknown as { __statuses: string[] }).__statuses);
    expect(statuses.some((t) => /^Computing… \d+ %$/.test(t))).toBe(true);
    expect(Number.parseFloat(await text(page, "covered-protected-10"))).toBeGreaterThanOrEqual(
      Number.parseFloat(covered0),
    );
    await pd.fill("2");
    await pd.press("Enter");
    await expect
      .poll(
        async () =>
          (await page
            .locator(".field-error")
            .first()
            .textContent()
            .catch(() => "")) ?? "",
      )
      .toMatch(/^Required Pd: 2 is above 0\.999$/);
    const g1 = await gen(page);
    await page.getByTestId("undo").click();
    await waitNewRun(page, g1);
    expect(await text(page, "covered-protected-10")).toBe(covered0);
    await openTab(page, "analysis");
    await expect.poll(() => text(page, "run-estimate")).toMatch(/Memory needed\d+ MiB/);
    await openTab(page, "radars");
    const models = page.getByTestId("radars-panel").locator("ul.plain-list li");
    const n = await models.count();
    await page.getByRole("button", { name: "Duplicate" }).click();
    await expect.poll(() => models.count()).toBe(n + 1);
    await page.getByRole("button", { name: "Edit" }).click();
    const form = page.getByTestId("radar-form");
    const range = form.getByTestId("rf-d-range");
    const range0 = (await range.textContent()) ?? "";
    const power = form.getByLabel("Peak power", { exact: true });
    const power0 = await power.inputValue();
    await power.fill(String(Number(power0) * 16));
    await power.press("Enter");
    // Free-space range grows as P^(1/4): 16× the power doubles it.
    await expect.poll(async () => (await range.textContent()) ?? "").not.toBe(range0);
    await power.fill("-5");
    await power.press("Enter");
    await expect
      .poll(async () => (await form.getByTestId("rf-error-transmitter.peakPowerW").textContent()) ?? "")
      .toMatch(/must be > 0 W \(got -5\)/);
    expect(await power.inputValue()).toBe("-5");
    expect(await power.getAttribute("aria-invalid")).toBe("true");
    await shoot(page, "radar-form");
    await form.getByLabel("Advanced (JSON)").check();
    const doc = form.getByLabel(/Model document/);
    expect(JSON.parse((await doc.inputValue()) || "{}").transmitter.peakPowerW).toBe(Number(power0) * 16);
    await form.getByLabel("Advanced (JSON)").uncheck();
    await page.getByTestId("undo").click();
    await expect.poll(() => power.inputValue()).toBe(power0);
    expect(await range.textContent()).toBe(range0);
    await form.getByLabel("Kind").selectOption("fmcw");
    await expect
      .poll(async () => (await form.getByTestId("rf-error-waveform.chirpBandwidthHz").textContent()) ?? "")
      .toMatch(/is required/);
    await shoot(page, "radar-form-fmcw");
    await form.getByLabel("Kind").selectOption("pulsed");
    // A measured azimuth cut from CSV through the file picker; then a bad file, refused by row.
    const importCut = async (name: string, csv: string) => {
      const file = join(work, name);
      writeFileSync(file, csv);
      const [chooser] = await Promise.all([
        page.waitForEvent("filechooser"),
        form.getByRole("button", { name: "Import pattern cut (CSV)…" }).first().click(),
      ]);
      await chooser.setFiles(file);
    };
    await importCut(
      "azimuth-cut.csv",
      "angle_deg,gain_db\n-180,-35\n-90,-28\n-20,-12\n0,0\n20,-12\n90,-28\n180,-35\n",
    );
    const cutTitle = form.locator(".rf-cut-title").first();
    await expect
      .poll(async () => (await cutTitle.textContent()) ?? "")
      .toMatch(/measured cut, 7 points, -180° to 180°/);
    await importCut("bad-cut.csv", "angle_deg,gain_db\n0,0\nten,-3\n");
    const refusal = form.locator(".rf-cut .field-error").first();
    await expect
      .poll(async () => (await refusal.textContent()) ?? "")
      .toMatch(/Not imported.*bad-cut\.csv: row 3, column "angle_deg": "ten" is not a number/);
    expect(await cutTitle.textContent()).toMatch(/measured cut, 7 points/);
    await form.getByRole("button", { name: "Use analytic shape" }).first().click();
    await expect.poll(async () => (await cutTitle.textContent()) ?? "").toMatch(/analytic main beam/);
    // Both are plan changes: undo brings the measured cut back, then the model as it was.
    await page.getByTestId("undo").click();
    await expect.poll(async () => (await cutTitle.textContent()) ?? "").toMatch(/measured cut, 7 points/);
    await page.getByTestId("undo").click();
    await expect.poll(async () => (await cutTitle.textContent()) ?? "").toMatch(/analytic main beam/);
    await form.getByRole("button", { name: "Close" }).click();
    await page.getByTestId("undo").click();
    await expect.poll(() => models.count()).toBe(n);
    // A model from scratch opens in the form, used by no post yet; undo takes it away.
    await page.getByRole("button", { name: "New model" }).click();
    await expect.poll(() => models.count()).toBe(n + 1);
    expect(await text(page, "model-users")).toBe("No post uses this model.");
    expect(await form.getByLabel("Name", { exact: true }).inputValue()).toBe("New radar model");
    await form.getByRole("button", { name: "Close" }).click();
    await page.getByTestId("undo").click();
    await expect.poll(() => models.count()).toBe(n);
    expect(await text(page, "model-users")).toMatch(/^Used by North-west knoll mast/);
    await shoot(page, "radars");
    await openTab(page, "posts");
  });

  it("inspects a point and reads its link budget and terrain profile", async () => {
    await openTab(page, "inspect");
    await page.getByTestId("tool-inspect").click();
    const b = await mapBox(page);
    await page.mouse.click(b.x + b.width * 0.55, b.y + b.height * 0.5);
    await page.getByTestId("link-budget").first().waitFor({ timeout: 60_000 });
    const budget = (await page.getByTestId("link-budget").first().textContent()) ?? "";
    expect(budget).toMatch(/dBW/);
    expect(budget).toMatch(/dBi/);
    expect(budget).toMatch(/SNR/i);
    expect(await text(page, "point-combined-pd")).toMatch(/^\d\.\d{3}$/);
    await page.getByTestId("profile-chart").locator("svg").first().waitFor({ timeout: 30_000 });
    const inspectShot = await shoot(page, "inspect");
    expect((await compareGolden(page, "inspect", inspectShot)).differingFraction).toBeLessThan(
      GOLDEN_TOLERANCE,
    );
    await page.keyboard.press("Escape");
    await openTab(page, "results");
  });

  it("adds a post, moves it, and the coverage follows", async () => {
    await openTab(page, "posts");
    const postsBefore = await page.getByTestId("post-list").locator("li").count();
    const summary0 = await summaryFigures(page);
    const gapArea0 = await text(page, "gap-area-10");
    const status0 = await gen(page);
    await page.getByTestId("tool-post").click();
    const b = await mapBox(page);
    // Inside the blind spot behind the ridge (the hatched band east of the fence), so a new radar there
    // must change the gap area.
    await page.mouse.click(b.x + b.width * 0.855, b.y + b.height * 0.7);
    await expect.poll(() => page.getByTestId("post-list").locator("li").count()).toBe(postsBefore + 1);
    await waitNewRun(page, status0);
    // A short-range FMCW model: the pulsed default is blind within c·τ/2 of itself.
    const statusModel = await gen(page);
    await page.getByTestId("post-model").selectOption("mossbee-58");
    await waitNewRun(page, statusModel);
    const summary1 = await summaryFigures(page);
    expect(summary1).not.toBe(summary0);
    expect(await text(page, "gap-area-10")).not.toBe(gapArea0);
    const marker = page.locator(".post-mark", { hasText: `Post ${postsBefore + 1}` });
    const mb = await marker.boundingBox();
    if (!mb) throw new Error("new post not on the map");
    const status1 = await gen(page);
    await page.mouse.move(mb.x + mb.width / 2, mb.y + mb.height / 2);
    await page.mouse.down();
    for (let k = 1; k <= 10; k++)
      await page.mouse.move(mb.x + mb.width / 2 + k * 12, mb.y + mb.height / 2 - k * 10);
    await page.mouse.up();
    await waitNewRun(page, status1);
    const summary2 = await summaryFigures(page);
    expect(summary2).not.toBe(summary1);
    await shoot(page, "post-moved");
    // Moved again and held still before the drop: the release was computed ahead while the pointer
    // rested (no radar left to compute when it is dropped), with the figures that a fresh evaluation of
    // the same plan (after a reload: new workers, empty caches) gives.
    const mb2 = await page.locator(".post-mark", { hasText: "South gate mast" }).boundingBox();
    if (!mb2) throw new Error("the south gate post is not on the map");
    const status2 = await gen(page);
    await page.mouse.move(mb2.x + mb2.width / 2, mb2.y + mb2.height / 2);
    await page.mouse.down();
    for (let k = 1; k <= 6; k++)
      await page.mouse.move(mb2.x + mb2.width / 2 - k * 8, mb2.y + mb2.height / 2 + k * 6);
    await page.waitForTimeout(800);
    await page.mouse.up();
    await waitNewRun(page, status2);
    expect(await page.getByTestId("summary").getAttribute("data-computed-radars")).toBe("0");
    const rested = await summaryFigures(page);
    expect(rested).not.toBe(summary2);
    // The same plan opened soon after the edit in a second tab: the plan and the demo's own DEM come
    // back from the browser's store and are evaluated afresh (new workers, empty caches).
    await page.waitForTimeout(500);
    const fresh = await h.context.newPage();
    try {
      await fresh.goto(h.baseUrl);
      await waitComputed(fresh);
      const untimed = (t: string) => t.replace(/computed in [^m]*ms/, "");
      expect(untimed(await summaryFigures(fresh))).toBe(untimed(rested));
    } finally {
      await fresh.close();
    }
  });

  it("draws a protected area with live measurements, and undoes and redoes it", async () => {
    await openTab(page, "site");
    const areas0 = await page.getByTestId("area-list").locator("li").count();
    await page.getByTestId("tool-area").click();
    // The drawing plugin loads on first use; its hint marker follows the pointer.
    await page.waitForTimeout(1000);
    const b = await mapBox(page);
    await page.mouse.move(b.x + b.width * 0.21, b.y + b.height * 0.21);
    const pts = [
      [0.2, 0.2],
      [0.32, 0.2],
      [0.32, 0.32],
      [0.2, 0.32],
    ];
    for (const [fx, fy] of pts) {
      await page.mouse.click(b.x + b.width * fx, b.y + b.height * fy);
      await page.waitForTimeout(150);
    }
    await page.mouse.move(b.x + b.width * 0.25, b.y + b.height * 0.3);
    await shoot(page, "drawing-progress");
    await expect.poll(() => text(page, "live-measure"), { timeout: 10_000 }).toMatch(/area .*(m²|ha)/);
    await shoot(page, "drawing");
    await page.mouse.click(b.x + b.width * pts[0][0], b.y + b.height * pts[0][1]);
    await expect.poll(() => page.getByTestId("area-list").locator("li").count()).toBe(areas0 + 1);
    await page.keyboard.press("Escape");
    await page.getByTestId("undo").click();
    await expect.poll(() => page.getByTestId("area-list").locator("li").count()).toBe(areas0);
    await page.getByTestId("redo").click();
    await expect.poll(() => page.getByTestId("area-list").locator("li").count()).toBe(areas0 + 1);
    // Keyboard shortcuts too.
    await page
      .locator("body")
      .click({ position: { x: 5, y: 5 } })
      .catch(() => undefined);
    await page.keyboard.press("Control+z");
    await expect.poll(() => page.getByTestId("area-list").locator("li").count()).toBe(areas0);
    await page.keyboard.press("Control+Shift+z");
    await expect.poll(() => page.getByTestId("area-list").locator("li").count()).toBe(areas0 + 1);
  });

  it("cuts a hole in the new protected area", async () => {
    await openTab(page, "site");
    const areaItem = page.getByTestId("area-list").locator("li").last();
    expect(await areaItem.textContent()).toMatch(/0 hole/);
    await page.getByTestId("tool-hole").click();
    await page.waitForTimeout(500);
    const b = await mapBox(page);
    const pts = [
      [0.24, 0.24],
      [0.28, 0.24],
      [0.28, 0.28],
      [0.24, 0.28],
      [0.24, 0.24],
    ];
    for (const [fx, fy] of pts) {
      await page.mouse.click(b.x + b.width * fx, b.y + b.height * fy);
      await page.waitForTimeout(150);
    }
    await expect.poll(async () => (await areaItem.textContent()) ?? "").toMatch(/1 hole/);
    await page.keyboard.press("Escape");
    await shoot(page, "hole");
  });

  it("switches layers, shows exposure circles and the safety cautions", async () => {
    await openTab(page, "results");
    for (const layer of ["overlap", "lowest", "single", "combined"]) {
      const status = await gen(page);
      await page.getByTestId(`layer-${layer}`).check();
      // These two layers come with a run of their own (from the workers' caches).
      if (layer === "single" || layer === "lowest") await waitNewRun(page, status);
      await expect
        .poll(() => text(page, "legend"))
        .toMatch(
          layer === "overlap"
            ? /Radars meeting/
            : layer === "lowest"
              ? /Lowest visible height \(m above ground\)/
              : /Pd/,
        );
      await page.waitForTimeout(300);
      await shoot(page, `layer-${layer}`);
    }
    await page.getByTestId("show-exposure").check();
    await page.waitForTimeout(300);
    // The legend explains the discs and the sector outlines it now shows.
    expect(await text(page, "legend")).toMatch(/RF-exposure distance, general public, antenna stopped/);
    expect(await text(page, "legend")).toMatch(/Radar sector and maximum instrumented range/);
    // RF labels give way to post names as gap labels do.
    const rfClashes = await labelsOnPostNames(page, ".exposure-label span");
    expect(rfClashes.shown).toBeGreaterThan(0);
    expect(rfClashes.clashes).toBe(0);
    await shoot(page, "exposure");
    await page.getByTestId("show-exposure").uncheck();
    await expect.poll(() => text(page, "legend")).not.toMatch(/RF-exposure distance/);
    await page.getByTestId("about").click();
    await expect.poll(() => text(page, "safety-cautions")).toMatch(/spectrum authorisation/);
    await expect.poll(() => text(page, "safety-cautions")).toMatch(/work at height/);
    await shoot(page, "about");
    await page.keyboard.press("Escape");
  });

  it("imports posts from a CSV dropped on the map, naming the bad rows", async () => {
    await openTab(page, "posts");
    const before = await page.getByTestId("post-list").locator("li").count();
    const plan = JSON.parse(readFileSync(join(DEMO, "plan.json"), "utf8"));
    const [lon, lat] = plan.protectedAreas[0].geometry.coordinates[0][0] as number[];
    const csv = `name,lat,lon,mast_height_m\nDropped A,${lat},${lon},9\nBad row,${lat},999,9\n`;
    await page.evaluate((content) => {
      const dt = new DataTransfer();
      dt.items.add(new File([content], "drop-posts.csv", { type: "text/csv" }));
      const target = document.querySelector(".map-wrap") as HTMLElement;
      target.dispatchEvent(new DragEvent("dragover", { dataTransfer: dt, bubbles: true, cancelable: true }));
      target.dispatchEvent(new DragEvent("drop", { dataTransfer: dt, bubbles: true, cancelable: true }));
    }, csv);
    await expect.poll(() => page.getByTestId("post-list").locator("li").count()).toBe(before + 1);
    await expect
      .poll(
        async () =>
          (await page
            .getByTestId("message-warning")
            .last()
            .textContent()
            .catch(() => "")) ?? "",
      )
      .toMatch(/1 post.*1 row\(s\) skipped/);
    expect(await page.locator(".messages").textContent()).toMatch(/row 3, column lon/);
  });

  it("draws a building with its height, and turns a post by its boresight handle", async () => {
    await openTab(page, "site");
    const count = async () => Number((await text(page, "terrain-summary")).match(/(\d+) buildings/)?.[1]);
    const before = await count();
    await page.getByTestId("tool-building").click();
    await page.waitForTimeout(500);
    const b = await mapBox(page);
    const pts = [
      [0.1, 0.85],
      [0.14, 0.85],
      [0.14, 0.89],
      [0.1, 0.89],
      [0.1, 0.85],
    ];
    for (const [fx, fy] of pts) {
      await page.mouse.click(b.x + b.width * fx, b.y + b.height * fy);
      await page.waitForTimeout(150);
    }
    await expect.poll(count).toBe(before + 1);
    await page.keyboard.press("Escape");
    await openTab(page, "posts");
    await page.getByTestId("post-list").getByRole("button", { name: "South gate mast" }).click();
    const az0 = await page.getByTestId("post-boresight").inputValue();
    const handle = page.locator(".boresight-handle");
    const hb = await handle.boundingBox();
    if (!hb) throw new Error("no boresight handle");
    const g0 = await gen(page);
    await page.mouse.move(hb.x + hb.width / 2, hb.y + hb.height / 2);
    await page.mouse.down();
    for (let k = 1; k <= 8; k++)
      await page.mouse.move(hb.x + hb.width / 2 + k * 8, hb.y + hb.height / 2 + k * 6);
    await page.mouse.up();
    await expect.poll(() => page.getByTestId("post-boresight").inputValue()).not.toBe(az0);
    await waitNewRun(page, g0);
    await shoot(page, "turned");
  });

  it("chooses a building on the map, changes its roof height and deletes it, with undo", async () => {
    await openTab(page, "posts");
    const b = await mapBox(page);
    // The building drawn in the case before, 10 m high: a click on it brings the Site tab forward.
    await page.mouse.click(b.x + b.width * 0.12, b.y + b.height * 0.87);
    await page.getByTestId("obstruction-editor").waitFor({ timeout: 5_000 });
    expect(await page.getByTestId("tab-site").getAttribute("aria-selected")).toBe("true");
    // Named as the map's tooltip names it (the drawn building is the plan's last one).
    expect(await text(page, "obstruction-editor")).toMatch(/^Building \d+Roof height/);
    const height = page.getByTestId("obstruction-height");
    expect(await height.inputValue()).toBe("10");
    const count = async () => Number((await text(page, "terrain-summary")).match(/(\d+) buildings/)?.[1]);
    const before = await count();
    const g0 = await gen(page);
    await height.fill("5000");
    await height.press("Enter");
    await expect
      .poll(() => text(page, "obstruction-editor"))
      .toMatch(/Roof height: 5000 m AGL is above 1000 m AGL/);
    await height.fill("35");
    await height.press("Enter");
    await waitNewRun(page, g0);
    await shoot(page, "building-chosen");
    await page.getByTestId("obstruction-delete").click();
    await expect.poll(count).toBe(before - 1);
    expect(await page.getByTestId("obstruction-editor").count()).toBe(0);
    await page.getByTestId("undo").click();
    await expect.poll(count).toBe(before);
    // Undo again: the height was one step of its own.
    await page.getByTestId("undo").click();
    await page.mouse.click(b.x + b.width * 0.12, b.y + b.height * 0.87);
    await expect.poll(() => page.getByTestId("obstruction-height").inputValue()).toBe("10");
    await page.getByRole("button", { name: "Done" }).click();
    expect(await page.getByTestId("obstruction-editor").count()).toBe(0);
    // A post clicked on the map brings its form forward under Posts.
    await page.locator(".post-mark", { hasText: "West fence mast" }).click();
    await expect.poll(() => page.getByTestId("tab-posts").getAttribute("aria-selected")).toBe("true");
    await expect.poll(() => text(page, "post-editor")).toMatch(/West fence mast/i);
  });

  it("imports a DEM and a buildings file", async () => {
    await openTab(page, "site");
    const dem = join(work, "ridge-copy.tif");
    copyFileSync(join(DEMO, "terrain.tif"), dem);
    const status0 = await gen(page);
    await page.getByTestId("import-input").setInputFiles(dem);
    await expect
      .poll(() => text(page, "terrain-summary"), { timeout: 30_000 })
      .toMatch(/DEM ridge-copy\.tif/);
    await waitNewRun(page, status0);
    const plan = JSON.parse(readFileSync(join(DEMO, "plan.json"), "utf8"));
    const ring = plan.protectedAreas[0].geometry.coordinates[0] as number[][];
    const [lon, lat] = ring[0];
    const fc = {
      type: "FeatureCollection",
      features: [
        {
          type: "Feature",
          properties: { "building:levels": 4, name: "<b>Annex</b>" },
          geometry: squareGeometry(lon, lat, 0.0002),
        },
      ],
    };
    const before = (await text(page, "terrain-summary")).match(/(\d+) buildings/)?.[1];
    const file = join(work, "annex.geojson");
    writeFileSync(file, JSON.stringify(fc));
    await page.getByTestId("import-input").setInputFiles(file);
    await expect
      .poll(async () => (await text(page, "terrain-summary")).match(/(\d+) buildings/)?.[1])
      .toBe(String(Number(before) + 1));
    // User text is shown as text: no <b> element was made from the attribute.
    expect(await page.locator(".leaflet-container b").count()).toBe(0);
    // A town's worth of footprints (an OSM export): imported in one step, drawn on one canvas instead
    // of an SVG path each, and undone in one step.
    // Footprints drawn as SVG carry the building fill colour (siteLayer.ts BUILDING_STYLE).
    const svgPaths = () => page.locator('.leaflet-overlay-pane svg path[fill="#8c7b70"]').count();
    const paths0 = await svgPaths();
    expect(paths0).toBeGreaterThan(0);
    const town = {
      type: "FeatureCollection",
      features: Array.from({ length: 1500 }, (_, k) => ({
        type: "Feature",
        properties: { height: 6 + (k % 9) },
        geometry: squareGeometry(lon + 0.0004 * (k % 50), lat - 0.004 - 0.0004 * Math.floor(k / 50), 0.0001),
      })),
    };
    const townFile = join(work, "town.geojson");
    writeFileSync(townFile, JSON.stringify(town));
    const g1 = await gen(page);
    await page.getByTestId("import-input").setInputFiles(townFile);
    await expect
      .poll(async () => (await text(page, "terrain-summary")).match(/(\d+) buildings/)?.[1], {
        timeout: 30_000,
      })
      .toBe(String(Number(before) + 1501));
    expect(await page.locator(".leaflet-overlay-pane canvas").count()).toBeGreaterThan(0);
    expect(await svgPaths()).toBe(0);
    await waitNewRun(page, g1);
    await shoot(page, "town-imported");
    await page.getByTestId("undo").click();
    await expect
      .poll(async () => (await text(page, "terrain-summary")).match(/(\d+) buildings/)?.[1])
      .toBe(String(Number(before) + 1));
    await expect.poll(svgPaths).toBe(paths0);
  });

  it("refuses a bad file with a message and keeps the plan", async () => {
    const summary = await text(page, "terrain-summary");
    const bad = join(work, "broken.tif");
    writeFileSync(bad, Buffer.from("this is not a tiff at all"));
    await page.getByTestId("import-input").setInputFiles(bad);
    await page.getByTestId("message-error").last().waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("message-error").last().textContent()).toMatch(/broken\.tif/);
    expect(await text(page, "terrain-summary")).toBe(summary);
    const future = join(work, "future.json");
    const plan = JSON.parse(readFileSync(join(DEMO, "plan.json"), "utf8"));
    writeFileSync(future, JSON.stringify({ ...plan, version: 99, site: { name: "Should not load" } }));
    await page.getByTestId("import-input").setInputFiles(future);
    await expect
      .poll(async () => (await page.getByTestId("message-error").last().textContent()) ?? "")
      .toMatch(/newer Picket/);
    expect(await text(page, "site-name")).toMatch(/Ridge waterworks/);
    await shoot(page, "bad-file");
  });

  it("keeps a protected area that crosses itself, names it, and leaves it out of the run until undone", async () => {
    await openTab(page, "site");
    const areas0 = await page.getByTestId("area-list").locator("li").count();
    const summary0 = await summaryFigures(page);
    await page.getByTestId("tool-area").click();
    await page.waitForTimeout(500);
    const b = await mapBox(page);
    // A bow tie: the second edge crosses the fourth.
    for (const [fx, fy] of [
      [0.12, 0.12],
      [0.2, 0.2],
      [0.2, 0.12],
      [0.12, 0.2],
      [0.12, 0.12],
    ]) {
      await page.mouse.click(b.x + b.width * fx, b.y + b.height * fy);
      await page.waitForTimeout(150);
    }
    await expect.poll(() => page.getByTestId("area-list").locator("li").count()).toBe(areas0 + 1);
    await page.keyboard.press("Escape");
    await expect.poll(() => text(page, "area-problem")).toMatch(/crosses itself/);
    await expect.poll(() => text(page, "run-status")).toMatch(/Not computed: protectedAreas\[\d+\]/);
    // The results of the last good plan stay on screen; nothing else was lost.
    expect(await summaryFigures(page)).toBe(summary0);
    // The top bar stays one line with the refusal in it (cut, its whole text in the title).
    const bar = await page.locator(".topbar").boundingBox();
    const about = await page.getByTestId("about").boundingBox();
    expect(about && bar && about.y + about.height <= bar.y + 44).toBe(true);
    await shoot(page, "self-crossing-area");
    const before = await gen(page);
    await page.getByTestId("undo").click();
    await expect.poll(() => page.getByTestId("area-list").locator("li").count()).toBe(areas0);
    expect(await page.getByTestId("area-problem").count()).toBe(0);
    await waitNewRun(page, before);
  });

  it("finds the plan intact after a reload", async () => {
    await openTab(page, "site");
    const areas = await page.getByTestId("area-list").locator("li").count();
    const terrain = await text(page, "terrain-summary");
    await openTab(page, "posts");
    const posts = await page.getByTestId("post-list").locator("li").count();
    await page.waitForTimeout(500);
    await page.reload();
    await waitComputed(page);
    await openTab(page, "posts");
    expect(await page.getByTestId("post-list").locator("li").count()).toBe(posts);
    await openTab(page, "site");
    expect(await page.getByTestId("area-list").locator("li").count()).toBe(areas);
    expect(await text(page, "terrain-summary")).toBe(terrain);
  });

  it("exports the plan file and opens it again", async () => {
    await openTab(page, "posts");
    const posts = await page.getByTestId("post-list").locator("li").count();
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByTestId("save-plan").click(),
    ]);
    const saved = join(work, "saved-plan.json");
    await download.saveAs(saved);
    const doc = JSON.parse(readFileSync(saved, "utf8"));
    expect(doc.version).toBe(1);
    expect(doc.posts).toHaveLength(posts);
    // Change the plan, then open the saved file: it comes back as saved.
    await page.getByTestId("post-list").locator("li input[type=checkbox]").first().uncheck();
    const [chooser] = await Promise.all([
      page.waitForEvent("filechooser"),
      page.getByTestId("open-plan").click(),
    ]);
    await chooser.setFiles(saved);
    await expect
      .poll(async () => (await page.getByTestId("message-info").last().textContent()) ?? "")
      .toMatch(/Opened saved-plan\.json/);
    expect(await page.getByTestId("post-list").locator("li input[type=checkbox]").first().isChecked()).toBe(
      doc.posts[0].enabled,
    );
    await waitComputed(page);
    const shot = await shoot(page, "reopened");
    expect(shot).toMatch(/reopened\.png$/);
  });

  it("saves a bundle with the DEM and opens it again", async () => {
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByTestId("save-bundle").click(),
    ]);
    const saved = join(work, "bundle.zip");
    await download.saveAs(saved);
    const bytes = readFileSync(saved);
    expect(bytes.subarray(0, 2).toString("latin1")).toBe("PK");
    const [chooser] = await Promise.all([
      page.waitForEvent("filechooser"),
      page.getByTestId("open-plan").click(),
    ]);
    await chooser.setFiles(saved);
    await expect
      .poll(
        async () =>
          (await page
            .getByTestId("message-info")
            .last()
            .textContent()
            .catch(() => "")) ?? "",
      )
      .toMatch(/Opened bundle\.zip/);
    await openTab(page, "site");
    expect(await text(page, "terrain-summary")).toMatch(/^DEM /);
    await waitComputed(page);
  });

  it("opens the second demo site from the list and comes back to the plan it replaced", async () => {
    const name = await text(page, "site-name");
    const recent = page.getByTestId("recent-plans");
    const g0 = await gen(page);
    await recent.selectOption({ label: "Container terminal (invented demo site)" });
    await expect.poll(() => text(page, "site-name")).toBe("Container terminal (invented demo site)");
    await waitNewRun(page, g0);
    // Flat ground, said plainly; stacked containers leave gaps between them at 10 m.
    await expect.poll(() => text(page, "run-notes")).toMatch(/No DEM: the ground is flat at 62 m/);
    expect(await summaryFigures(page)).toMatch(/Protected area covered/);
    await shoot(page, "container-terminal");
    const entry = async () =>
      (await recent.locator("option").allTextContents()).find((t) => t.startsWith(`${name} (`));
    await expect.poll(entry).toBeTruthy();
    const g1 = await gen(page);
    await recent.selectOption({ label: (await entry()) as string });
    await expect.poll(() => text(page, "site-name")).toBe(name);
    await waitNewRun(page, g1);
  });

  it("keeps the plan it replaces in the recent list: New, then Recent brings it back with its DEM", async () => {
    await openTab(page, "site");
    // An edit saved to no file: the site renamed.
    const name = "Ridge waterworks, edited and not saved";
    const field = page.getByLabel("Site name");
    await field.fill(name);
    await field.press("Enter");
    await expect.poll(() => text(page, "site-name")).toBe(name);
    const terrain = await text(page, "terrain-summary");
    await openTab(page, "posts");
    const postCount = await page.getByTestId("post-list").locator("li").count();
    await page.getByRole("button", { name: "New", exact: true }).click();
    await expect.poll(() => text(page, "site-name")).toMatch(/^New site \d{4}-\d\d-\d\d \d\d:\d\d$/);
    const recent = page.getByTestId("recent-plans");
    // Each entry reads "name (saved at)".
    const entry = async () =>
      (await recent.locator("option").allTextContents()).find((t) => t.startsWith(`${name} (`));
    await expect.poll(entry).toBeTruthy();
    const g0 = await gen(page);
    await recent.selectOption({ label: (await entry()) as string });
    await expect.poll(() => text(page, "site-name")).toBe(name);
    expect(await page.getByTestId("post-list").locator("li").count()).toBe(postCount);
    await openTab(page, "site");
    expect(await text(page, "terrain-summary")).toBe(terrain);
    await waitNewRun(page, g0);
    expect((await page.getByTestId("message-warning").allTextContents()).join(" ")).not.toMatch(
      /is not in this file/,
    );
    await openTab(page, "posts");
  });

  it("uses a tile server only when the user sets one, with its attribution shown as text", async () => {
    await page.getByTestId("about").click();
    const template = `${h.baseUrl}test-tiles/{z}/{x}/{y}.png`;
    await page.getByLabel("Tile URL template").fill(template);
    await page.getByLabel("Attribution").fill("<i>Test tiles</i> & friends");
    const site = await text(page, "site-name");
    const before = h.requests.length;
    // The page's image policy admits only the origin set at start-up: the page reloads by itself.
    const reloaded = page.waitForEvent("load");
    await page.getByRole("button", { name: "Use this tile server" }).click();
    await reloaded;
    await waitComputed(page);
    expect(await text(page, "site-name")).toBe(site);
    await page.waitForTimeout(500);
    const tileRequests = h.requests.slice(before).filter((u) => u.includes("/test-tiles/"));
    expect(tileRequests.length).toBeGreaterThan(0);
    expect(await page.locator(".leaflet-control-attribution").textContent()).toContain(
      "<i>Test tiles</i> & friends",
    );
    // Back to the offline basemap.
    await page.getByTestId("about").click();
    await page.getByLabel("Tile URL template").fill("");
    await page.getByRole("button", { name: "Offline basemap only" }).click();
    await page.keyboard.press("Escape");
    await page.reload();
    await waitComputed(page);
    const after = h.requests.length;
    await page.waitForTimeout(500);
    expect(h.requests.slice(after).filter((u) => u.includes("/test-tiles/"))).toEqual([]);
  });

  it("replaces a crashed worker, tells the user, and keeps the plan", async () => {
    await page.goto(`${h.baseUrl}?test=1`);
    await waitComputed(page);
    const site = await text(page, "site-name");
    const status = await gen(page);
    await page.evaluate(() =>
      (window as unknown as { picketTest: { crashWorker(): Promise<void> } }).picketTest.crashWorker(),
    );
    await expect
      .poll(
        async () =>
          (await page
            .getByTestId("message-error")
            .last()
            .textContent()
            .catch(() => "")) ?? "",
      )
      .toMatch(/worker crashed.*plan is intact/);
    await waitNewRun(page, status);
    expect(await text(page, "site-name")).toBe(site);
  });
});
