/** Plans for the site-grid tests: the v1 example plan, edited, and square protected areas. */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Plan } from "../../src/io/planSchema.ts";
import { parsePlan } from "../../src/io/planValidation.ts";

const v1Text = readFileSync(join(import.meta.dirname, "../fixtures/planFormat/example-plan.v1.json"), "utf8");

/** The validated v1 example plan, changed by `edit` when given. */
export function examplePlan(edit?: (p: Plan) => void): Plan {
  const r = parsePlan(JSON.parse(v1Text));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  edit?.(r.plan);
  return r.plan;
}

/** A square protected area of half-side `halfDeg` around (lon, lat). */
export function squareAround(lon: number, lat: number, halfDeg: number): Plan["protectedAreas"][number] {
  const ring = [
    [lon - halfDeg, lat - halfDeg],
    [lon + halfDeg, lat - halfDeg],
    [lon + halfDeg, lat + halfDeg],
    [lon - halfDeg, lat + halfDeg],
    [lon - halfDeg, lat - halfDeg],
  ];
  return { id: "sq", name: "Square", geometry: { type: "Polygon", coordinates: [ring] } };
}
