/**
 * Writes docs/plan.schema.json and docs/radar.schema.json from the zod schemas.
 * Run: npx tsx scripts/export-plan-schema.ts   (tests/unit/planSchema.test.ts fails when they are stale)
 */
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { jsonSchemaText, planJsonSchema, radarJsonSchema } from "../src/io/planJsonSchema.ts";

const docs = join(import.meta.dirname, "..", "docs");
writeFileSync(join(docs, "plan.schema.json"), jsonSchemaText(planJsonSchema()));
writeFileSync(join(docs, "radar.schema.json"), jsonSchemaText(radarJsonSchema()));
console.log("wrote docs/plan.schema.json and docs/radar.schema.json");
