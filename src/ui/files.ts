/**
 * Opening and saving plan files (browser-fs-access): a plan .json, or a bundle .zip (fflate) holding
 * plan.json and the DEM file it refers to. A file that does not read is refused with a message, and the
 * plan on screen stays as it was.
 */
import { fileOpen, fileSave } from "browser-fs-access";
import { strFromU8, strToU8, unzipSync, zipSync } from "fflate";
import type { Plan } from "../io/planSchema";
import { type DemAsset, useAssets } from "./assets";
import { rememberRecent, storedDem } from "./autosave";
import { loadDemo } from "./demo";
import { planToText, readPlanText } from "./planText";
import { say } from "./session";
import { usePlanStore } from "./store";

/** The file name a plan is saved under, from its site name. */
export function planFileName(plan: Plan, ext: string): string {
  const slug = plan.site.name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-|-$/g, "");
  return `${slug || "plan"}${ext}`;
}

/** Makes a bundle: plan.json plus the DEM under its own name. */
export function makeBundle(plan: Plan, dem: DemAsset | null): Uint8Array {
  const files: Record<string, Uint8Array> = { "plan.json": strToU8(planToText(plan)) };
  if (dem) files[dem.fileName] = new Uint8Array(dem.bytes);
  return zipSync(files, { level: 6 });
}

export type OpenedFile =
  | { ok: true; plan: Plan; dem: DemAsset | null }
  | { ok: false; message: string; details: string[] };

/** Reads a chosen file (plan .json or bundle .zip) without loading it. */
export async function readPlanFile(name: string, bytes: ArrayBuffer): Promise<OpenedFile> {
  const u8 = new Uint8Array(bytes);
  const isZip = u8.length >= 4 && u8[0] === 0x50 && u8[1] === 0x4b && u8[2] === 0x03 && u8[3] === 0x04;
  if (!isZip) {
    const r = readPlanText(new TextDecoder().decode(u8), name);
    return r.ok ? { ok: true, plan: r.plan, dem: null } : r;
  }
  let entries: Record<string, Uint8Array>;
  try {
    entries = unzipSync(u8);
  } catch (e) {
    return { ok: false, message: `${name} is not a readable bundle`, details: [String(e)] };
  }
  const planEntry = entries["plan.json"];
  if (!planEntry) return { ok: false, message: `${name} holds no plan.json`, details: Object.keys(entries) };
  const r = readPlanText(strFromU8(planEntry), `${name}/plan.json`);
  if (!r.ok) return r;
  const g = r.plan.terrain.ground;
  let dem: DemAsset | null = null;
  if (g.type === "dem") {
    const d = entries[g.file];
    if (!d)
      return {
        ok: false,
        message: `${name} does not hold the DEM ${g.file} its plan refers to`,
        details: [],
      };
    dem = { fileName: g.file, bytes: d.slice().buffer };
  }
  return { ok: true, plan: r.plan, dem };
}

/** Adds a plan to the recent list; a failure of the browser's storage is said, not thrown. */
function keepRecent(plan: Plan): void {
  rememberRecent(plan).catch((e) =>
    say("warning", `"${plan.site.name}" could not be kept in the recent plans: ${String(e)}`),
  );
}

/**
 * Puts `next` on screen in place of the current plan (history cleared). The current plan goes to the
 * recent list first, so that New or Open never loses work that was not saved to a file.
 */
export function replacePlan(next: Plan): void {
  const current = usePlanStore.getState().plan;
  if (current && current !== next) keepRecent(current);
  usePlanStore.getState().load(next);
}

/**
 * Loads an opened file as the current plan and remembers it in the recent list. A plan that names a
 * DEM the file does not hold takes the DEM of that name stored in this browser, if there is one.
 */
export async function loadOpened(
  opened: Extract<OpenedFile, { ok: true }>,
  sourceName: string,
): Promise<void> {
  const g = opened.plan.terrain.ground;
  let dem = opened.dem;
  if (!dem && g.type === "dem" && useAssets.getState().dem?.fileName !== g.file) {
    dem = await storedDem(g.file).catch(() => null);
    if (!dem)
      say("warning", `${sourceName}: the DEM ${g.file} is not in this file; import it to use the terrain.`);
  }
  if (dem) useAssets.getState().setDem(dem);
  replacePlan(opened.plan);
  keepRecent(opened.plan);
  say("info", `Opened ${sourceName}.`);
}

/** File picker for a plan or bundle. */
export async function openPlanFromPicker(): Promise<void> {
  let file: File;
  try {
    file = await fileOpen({
      description: "Picket plan or bundle",
      mimeTypes: ["application/json", "application/zip"],
      extensions: [".json", ".zip"],
    });
  } catch {
    return; // the user closed the picker
  }
  await openPlanFile(file);
}

/** Opens one File as a plan; reports problems and keeps the current plan when it does not read. */
export async function openPlanFile(file: File): Promise<boolean> {
  const opened = await readPlanFile(file.name, await file.arrayBuffer());
  if (!opened.ok) {
    say("error", opened.message, opened.details);
    return false;
  }
  await loadOpened(opened, file.name);
  return true;
}

export async function savePlanToFile(plan: Plan): Promise<void> {
  const blob = new Blob([planToText(plan)], { type: "application/json" });
  await fileSave(blob, { fileName: planFileName(plan, ".json"), extensions: [".json"] }).catch(
    () => undefined,
  );
  keepRecent(plan);
}

export async function saveBundleToFile(plan: Plan, dem: DemAsset | null): Promise<void> {
  const blob = new Blob([makeBundle(plan, dem) as Uint8Array<ArrayBuffer>], { type: "application/zip" });
  await fileSave(blob, { fileName: planFileName(plan, ".zip"), extensions: [".zip"] }).catch(() => undefined);
}

/** Opens an embedded demo site in place of the current plan (which goes to the recent list). */
export async function openDemo(id: string): Promise<void> {
  const demo = await loadDemo(id);
  if (demo.missing) {
    say("error", demo.problem ?? `The demo site ${id} could not be opened.`);
    return;
  }
  useAssets.getState().setDem(demo.dem);
  replacePlan(demo.plan);
  if (demo.problem) say("warning", demo.problem);
  else say("info", `Opened the demo site ${demo.plan.site.name}.`);
}
