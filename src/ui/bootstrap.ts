/**
 * Start-up: narrow the image policy to the chosen tile server, restore the autosaved plan (or open the
 * demo), start autosave, and re-evaluate on every plan or DEM change.
 */
import { useAssets } from "./assets";
import { restoreAutosave, startAutosave } from "./autosave";
import { notePolicyOrigin, tileOrigin, useBasemap } from "./basemap";
import { loadDemo } from "./demo";
import { crashWorkerForTest, runEvaluation, scheduleEvaluation } from "./engine";
import { say, useSession } from "./session";
import { redo, undo, usePlanStore } from "./store";

function narrowImagePolicy(): void {
  const origin = tileOrigin(useBasemap.getState().server);
  const meta = document.createElement("meta");
  meta.httpEquiv = "Content-Security-Policy";
  meta.content = `img-src 'self' data: blob:${origin ? ` ${origin}` : ""}`;
  document.head.appendChild(meta);
  notePolicyOrigin(origin);
}

function isTyping(t: EventTarget | null): boolean {
  const el = t as HTMLElement | null;
  return (
    !!el &&
    (el.tagName === "INPUT" || el.tagName === "TEXTAREA" || el.tagName === "SELECT" || el.isContentEditable)
  );
}

export async function bootstrap(): Promise<void> {
  narrowImagePolicy();
  let restored = null;
  try {
    const r = await restoreAutosave();
    restored = r.restored;
    if (r.problem) say("warning", `The autosaved plan could not be restored and was set aside: ${r.problem}`);
  } catch (e) {
    say("warning", `The browser storage could not be read: ${String(e)}`);
  }
  if (restored) {
    if (restored.dem) useAssets.getState().setDem(restored.dem);
    usePlanStore.getState().load(restored.plan);
  } else {
    const demo = await loadDemo();
    if (demo.dem) useAssets.getState().setDem(demo.dem);
    usePlanStore.getState().load(demo.plan);
    if (demo.problem) say("warning", demo.problem);
  }
  startAutosave((m) => say("error", m));
  usePlanStore.subscribe((s, prev) => {
    if (s.plan !== prev.plan) scheduleEvaluation();
  });
  useAssets.subscribe((s, prev) => {
    if (s.dem !== prev.dem) scheduleEvaluation();
  });
  // The single-radar layer needs that radar's arrays, the lowest-height layer its merge over the
  // radars (runs merge it only while it is shown): from the worker's cache, no radar recomputed.
  useSession.subscribe((s, prev) => {
    if (s.layer === "single" && (prev.layer !== "single" || s.singlePostId !== prev.singlePostId))
      scheduleEvaluation();
    if (s.layer === "lowest" && prev.layer !== "lowest") scheduleEvaluation();
  });
  window.addEventListener("keydown", (e) => {
    if (!(e.ctrlKey || e.metaKey) || isTyping(e.target)) return;
    const k = e.key.toLowerCase();
    if (k === "z" && !e.shiftKey) {
      e.preventDefault();
      undo();
    } else if ((k === "z" && e.shiftKey) || k === "y") {
      e.preventDefault();
      redo();
    }
  });
  if (new URLSearchParams(location.search).has("test")) {
    (window as unknown as { picketTest: object }).picketTest = { crashWorker: crashWorkerForTest };
  }
  await runEvaluation();
}
