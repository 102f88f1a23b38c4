/**
 * A plan as the page posts it to the coverage workers: its building footprints as JSON text, kept per
 * footprint collection, and the rest as an object. Posting a plan copies it (structured clone), and an
 * imported town of ten thousand footprints made that 20–30 ms of the page's time on every drag
 * preview; the text of footprints that did not change is made once and a string is copied in one go.
 */
import type { Plan } from "../io/planSchema";

export interface WirePlan {
  /** The plan with an empty footprint collection when `buildingsJson` carries them. */
  plan: Plan;
  /** The plan's terrain.buildings as JSON text. */
  buildingsJson?: string;
}

/** Below this many footprints the plan goes as it is (a copy costs less than a parse in the worker). */
export const BUILDINGS_AS_TEXT_ABOVE = 500;

const textOf = new WeakMap<object, string>();

export function planToWire(plan: Plan): WirePlan {
  const buildings = plan.terrain.buildings;
  if (buildings.features.length <= BUILDINGS_AS_TEXT_ABOVE) return { plan };
  let text = textOf.get(buildings);
  if (text === undefined) {
    text = JSON.stringify(buildings);
    textOf.set(buildings, text);
  }
  const empty = { ...buildings, features: [] };
  return { plan: { ...plan, terrain: { ...plan.terrain, buildings: empty } }, buildingsJson: text };
}

/**
 * The footprints last read in this thread: a drag sends the same text with every preview, and comparing
 * it costs far less than parsing it again. The parsed value is only read (the plan is validated into
 * a new object).
 */
let lastRead: { text: string; value: unknown } | null = null;

/** The plan a WirePlan stands for (not yet validated: the worker parses it as any plan input). */
export function planFromWire(w: { plan: unknown; buildingsJson?: string }): unknown {
  const text = w.buildingsJson;
  if (text === undefined) return w.plan;
  const plan = w.plan as { terrain?: object } | null;
  if (typeof plan !== "object" || plan === null || typeof plan.terrain !== "object" || plan.terrain === null)
    return w.plan;
  if (lastRead?.text !== text) lastRead = { text, value: JSON.parse(text) };
  return { ...plan, terrain: { ...plan.terrain, buildings: lastRead.value } };
}
