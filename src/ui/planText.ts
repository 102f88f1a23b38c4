/**
 * Reading a plan document from text: JSON syntax errors by line and column, then the schema with a named
 * path for every bad field. A plan from a newer format version is refused with a clear message. Nothing
 * here touches the plan being edited: the caller loads the result only when it is ok.
 */
import { formatJsonSyntaxError, parseJsonText } from "../io/jsonText";
import type { Plan } from "../io/planSchema";
import { PLAN_VERSION } from "../io/planSchema";
import { parsePlan, withItemNames } from "../io/planValidation";

export type PlanTextResult = { ok: true; plan: Plan } | { ok: false; message: string; details: string[] };

export function readPlanText(text: string, fileName: string): PlanTextResult {
  const json = parseJsonText(text);
  if (!json.ok) {
    return {
      ok: false,
      message: `${fileName} is not a readable plan file`,
      details: [formatJsonSyntaxError(json.error)],
    };
  }
  const v = (json.value as { version?: unknown } | null)?.version;
  if (typeof v === "number" && v > PLAN_VERSION) {
    return {
      ok: false,
      message: `${fileName} was written by a newer Picket (plan format ${v}; this one reads up to ${PLAN_VERSION}). Nothing was changed.`,
      details: [],
    };
  }
  const parsed = parsePlan(json.value);
  if (!parsed.ok) {
    return {
      ok: false,
      message: `${fileName} has ${parsed.errors.length} problem${parsed.errors.length === 1 ? "" : "s"}; the plan on screen was kept`,
      details: withItemNames(parsed.errors, json.value).map((e) =>
        e.path ? `${e.path}: ${e.message}` : e.message,
      ),
    };
  }
  return { ok: true, plan: parsed.plan };
}

/**
 * The text of a plan file as saved: pretty-printed JSON; `compact` for the autosave, which runs after
 * every change (a third of the time on a plan holding thousands of footprints). readPlanText reads both.
 */
export function planToText(plan: Plan, options: { compact?: boolean } = {}): string {
  return options.compact ? JSON.stringify(plan) : `${JSON.stringify(plan, null, 2)}\n`;
}
