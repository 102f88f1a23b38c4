/**
 * Validation of a plan document: migrate to the current version, check every field (planSchema),
 * then the rules across fields. Every error names its path and rule, e.g.
 * `posts[3].mastHeightM: 5200 is above the 300 m limit`. parsePlan never throws and never
 * modifies its input, so the caller keeps the user's work whatever the outcome.
 */
import type { RadarModel } from "../coverage/radarModel.ts";
import { formatJsonSyntaxError, parseJsonText } from "./jsonText.ts";
import { migratePlan } from "./planMigrations.ts";
import { type Plan, type Post, planSchema } from "./planSchema.ts";
import { type FieldError, formatErrors, issuesToErrors } from "./schemaFields.ts";
import { UTM_MAX_LAT_DEG, UTM_MIN_LAT_DEG } from "./siteGrid.ts";

export type PlanError = FieldError;

export type ParsePlanResult =
  | {
      ok: true;
      plan: Plan /** The format version the document was written in (migrated when older). */;
      fromVersion: number;
    }
  | { ok: false; errors: PlanError[] };

/** Errors as lines `path: message`. */
export const formatPlanErrors = formatErrors;

function duplicateIds(list: readonly { id: string }[], listPath: string, errors: PlanError[]): void {
  const seen = new Map<string, number>();
  list.forEach((item, i) => {
    const first = seen.get(item.id);
    if (first !== undefined) {
      errors.push({
        path: `${listPath}[${i}].id`,
        message: `"${item.id}" is already used by ${listPath}[${first}]`,
      });
    } else seen.set(item.id, i);
  });
}

function quoteList(ids: readonly string[]): string {
  if (ids.length === 0) return "none defined";
  const shown = ids.slice(0, 8).map((id) => `"${id}"`);
  return ids.length > 8 ? `${shown.join(", ")}, …` : shown.join(", ");
}

function latitudeOutsideUtm(latDeg: number): string | null {
  if (latDeg > UTM_MAX_LAT_DEG) {
    return `latitude ${latDeg} is beyond ${UTM_MAX_LAT_DEG}° N, the northern limit of the UTM site grid (polar sites are not supported)`;
  }
  if (latDeg < UTM_MIN_LAT_DEG) {
    return `latitude ${latDeg} is beyond ${-UTM_MIN_LAT_DEG}° S, the southern limit of the UTM site grid (polar sites are not supported)`;
  }
  return null;
}

/** The rules across fields of a plan that passed the schema. */
export function crossFieldErrors(plan: Plan): PlanError[] {
  const errors: PlanError[] = [];
  duplicateIds(plan.protectedAreas, "protectedAreas", errors);
  duplicateIds(plan.posts, "posts", errors);
  duplicateIds(plan.radarModels, "radarModels", errors);
  duplicateIds(plan.targetClasses, "targetClasses", errors);
  duplicateIds(plan.terrain.treeStands, "terrain.treeStands", errors);

  const modelIds = plan.radarModels.map((m) => m.id);
  plan.posts.forEach((post, i) => {
    if (post.radarModelId !== undefined && post.radarModel !== undefined) {
      errors.push({ path: `posts[${i}]`, message: "give radarModelId or an inline radarModel, not both" });
    } else if (post.radarModelId === undefined && post.radarModel === undefined) {
      errors.push({ path: `posts[${i}].radarModelId`, message: "is required (or an inline radarModel)" });
    } else if (post.radarModelId !== undefined && !modelIds.includes(post.radarModelId)) {
      errors.push({
        path: `posts[${i}].radarModelId`,
        message: `"${post.radarModelId}" is not a model in radarModels (${quoteList(modelIds)})`,
      });
    }
    const lat = latitudeOutsideUtm(post.position.latDeg);
    if (lat) errors.push({ path: `posts[${i}].position.latDeg`, message: lat });
  });

  const classIds = plan.targetClasses.map((t) => t.id);
  plan.requirement.targetClassIds?.forEach((id, i) => {
    if (!classIds.includes(id)) {
      errors.push({
        path: `requirement.targetClassIds[${i}]`,
        message: `"${id}" is not a target class (${quoteList(classIds)})`,
      });
    }
  });

  const heights = plan.analysis.targetHeightsM;
  heights.forEach((h, i) => {
    const first = heights.indexOf(h);
    if (first !== i) {
      errors.push({
        path: `analysis.targetHeightsM[${i}]`,
        message: `${h} m is listed twice (also analysis.targetHeightsM[${first}])`,
      });
    }
  });
  plan.targetClasses.forEach((tc, i) => {
    tc.heightsAglM.forEach((h, j) => {
      if (!heights.includes(h)) {
        errors.push({
          path: `targetClasses[${i}].heightsAglM[${j}]`,
          message: `${h} m is not one of analysis.targetHeightsM (${heights.join(", ")} m)`,
        });
      }
    });
  });

  plan.terrain.buildings.features.forEach((f, i) => {
    const { height, min_height } = f.properties;
    if (height !== undefined && min_height !== undefined && !(min_height < height)) {
      errors.push({
        path: `terrain.buildings.features[${i}].properties.min_height`,
        message: `${min_height} m is not below height (${height} m)`,
      });
    }
  });

  plan.protectedAreas.forEach((area, a) => {
    const g = area.geometry;
    const polygons = g.type === "Polygon" ? [g.coordinates] : g.coordinates;
    polygons.forEach((rings, p) => {
      rings.forEach((ring, r) => {
        const k = ring.findIndex((pos) => latitudeOutsideUtm(pos[1]) !== null);
        if (k >= 0) {
          const where = g.type === "Polygon" ? `[${r}][${k}]` : `[${p}][${r}][${k}]`;
          errors.push({
            path: `protectedAreas[${a}].geometry.coordinates${where}[1]`,
            message: latitudeOutsideUtm(ring[k][1])!,
          });
        }
      });
    });
  });
  return errors;
}

/**
 * Validate a parsed JSON value as a plan: migrate older versions, check fields, check the rules
 * across fields. Never throws, never modifies `json`; on failure, every error names its path.
 */
export function parsePlan(json: unknown): ParsePlanResult {
  try {
    const migrated = migratePlan(json);
    if (!migrated.ok) return { ok: false, errors: migrated.errors };
    const r = planSchema.safeParse(migrated.doc);
    if (!r.success) return { ok: false, errors: issuesToErrors(r.error.issues) };
    const plan = r.data as Plan;
    const errors = crossFieldErrors(plan);
    if (errors.length > 0) return { ok: false, errors };
    return { ok: true, plan, fromVersion: migrated.fromVersion };
  } catch (err) {
    // Last resort for values no JSON file can hold (proxies, getters that throw, cycles too deep).
    return { ok: false, errors: [{ path: "(file)", message: `cannot be read as a plan (${String(err)})` }] };
  }
}

/** The lists whose items carry a display name, and what an item is called in a message. */
const NAMED_LISTS: Record<string, string> = {
  posts: "post",
  protectedAreas: "protected area",
  targetClasses: "target class",
  radarModels: "radar model",
};

/**
 * Errors of a plan document with the named item each lies in said after the message
 * (`posts[3].mastHeightM: 5200 is above the 300 m limit (post "South gate")`), read from the
 * document as it stands, so that a long list need not be counted by hand.
 */
export function withItemNames(errors: readonly PlanError[], doc: unknown): PlanError[] {
  return errors.map((e) => {
    const m = /^([A-Za-z]+)\[(\d+)\]/.exec(e.path);
    const what = m ? NAMED_LISTS[m[1]] : undefined;
    if (!m || what === undefined) return e;
    const list = (doc as Record<string, unknown> | null)?.[m[1]];
    const name = Array.isArray(list)
      ? (list[Number(m[2])] as { name?: unknown } | undefined)?.name
      : undefined;
    return typeof name === "string" && name !== "" && e.path !== `${m[0]}.name`
      ? { ...e, message: `${e.message} (${what} ${JSON.stringify(name)})` }
      : e;
  });
}

/**
 * Parse and validate the text of a plan file; JSON syntax errors are named by line and column, and
 * field errors by the named item they lie in (withItemNames).
 */
export function loadPlanFile(text: string): ParsePlanResult {
  const json = parseJsonText(text);
  if (!json.ok)
    return { ok: false, errors: [{ path: "(file)", message: formatJsonSyntaxError(json.error) }] };
  const r = parsePlan(json.value);
  return r.ok ? r : { ok: false, errors: withItemNames(r.errors, json.value) };
}

/** The radar model a post of a validated plan uses (inline, or by id from plan.radarModels). */
export function radarModelOfPost(plan: Plan, post: Post): RadarModel | undefined {
  return post.radarModel ?? plan.radarModels.find((m) => m.id === post.radarModelId);
}
