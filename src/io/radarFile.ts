/**
 * Loading a radar model file (JSON text): syntax errors by line and column, then the schema's
 * named field errors. Never throws.
 */
import type { RadarModel } from "../coverage/radarModel.ts";
import { formatJsonSyntaxError, parseJsonText } from "./jsonText.ts";
import { parseRadarModel } from "./radarSchema.ts";
import type { FieldError } from "./schemaFields.ts";

export type LoadRadarModelResult = { ok: true; model: RadarModel } | { ok: false; errors: FieldError[] };

/** Parse and validate the text of a radar model file. */
export function loadRadarModelFile(text: string): LoadRadarModelResult {
  const json = parseJsonText(text);
  if (!json.ok)
    return { ok: false, errors: [{ path: "(file)", message: formatJsonSyntaxError(json.error) }] };
  return parseRadarModel(json.value);
}
