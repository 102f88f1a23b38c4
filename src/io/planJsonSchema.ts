/**
 * The published JSON Schemas of the plan and radar model files (docs/plan.schema.json,
 * docs/radar.schema.json), generated from the zod schemas so that they cannot drift.
 * Rules across fields (references, polygon validity, duty cycle) are not expressible in JSON
 * Schema and are checked only by parsePlan / parseRadarModel; docs/plan-format.md lists them.
 */
import { z } from "zod";
import { PLAN_VERSION, planSchema } from "./planSchema.ts";
import { radarModelSchema } from "./radarSchema.ts";

function publish(schema: z.ZodType, id: string, title: string): Record<string, unknown> {
  const json = z.toJSONSchema(schema, { io: "input", target: "draft-2020-12", unrepresentable: "any" });
  return { $id: id, title, ...json };
}

/** JSON Schema of a plan document of the current format version (what a file may contain). */
export function planJsonSchema(): Record<string, unknown> {
  return publish(
    planSchema,
    `https://picket.invalid/schema/plan-v${PLAN_VERSION}.json`,
    `Picket plan, format version ${PLAN_VERSION}`,
  );
}

/** JSON Schema of a radar model file. */
export function radarJsonSchema(): Record<string, unknown> {
  return publish(radarModelSchema, "https://picket.invalid/schema/radar.json", "Picket radar model");
}

/** The text written to docs/: two-space indentation and a final newline. */
export function jsonSchemaText(schema: Record<string, unknown>): string {
  return `${JSON.stringify(schema, null, 2)}\n`;
}
