/** The ridge waterworks demo site as the worker tests read it: its plan, validated, and its DEM bytes. */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Plan } from "../../src/io/planSchema";
import { parsePlan } from "../../src/io/planValidation";

export const RIDGE_DEMO_DIR = join(__dirname, "../../demo-sites/ridge-waterworks");

/** The demo plan after validation (defaults filled in), as a worker holds it. */
export function ridgeDemoPlan(): Plan {
  const r = parsePlan(JSON.parse(readFileSync(join(RIDGE_DEMO_DIR, "plan.json"), "utf8")));
  if (!r.ok) throw new Error("demo plan does not parse");
  return r.plan;
}

/** The demo's DEM as the page sends it with a request: a fresh ArrayBuffer each call (it is transferred). */
export function ridgeDemoDem(): { fileName: string; bytes: ArrayBuffer } {
  const b = readFileSync(join(RIDGE_DEMO_DIR, "terrain.tif"));
  return { fileName: "terrain.tif", bytes: b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) };
}
