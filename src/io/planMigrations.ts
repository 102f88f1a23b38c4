/**
 * Plan format versions and the migrations between them. A document is migrated step by step
 * to PLAN_VERSION before the schema sees it; a document from a newer version is refused with a
 * message that says so. Migrations build new objects and never modify their input.
 *
 * Version history:
 * - 0: approach ring as `approachRingKm` (kilometres); post positions as `lonLat: [lon, lat]`;
 *      post boresight as `azimuthDeg`.
 * - 1: `approachRingDepthM` (metres); `position: { lonDeg, latDeg }`; `boresightAzDeg`.
 */
import { PLAN_VERSION } from "./planSchema.ts";
import { describeValue, type FieldError } from "./schemaFields.ts";

/** The oldest format version this build still reads. */
export const OLDEST_PLAN_VERSION = 0;

const METRES_PER_KILOMETRE = 1000;

export type MigrationResult =
  | { ok: true; doc: Record<string, unknown>; fromVersion: number }
  | { ok: false; errors: FieldError[] };

type Doc = Record<string, unknown>;
type Migration = (doc: Doc) => { ok: true; doc: Doc } | { ok: false; errors: FieldError[] };

function isRecord(v: unknown): v is Doc {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

/** Version 0 → 1: kilometres to metres for the ring, position objects, boresight renamed. */
export function migrateV0toV1(doc: Doc): { ok: true; doc: Doc } | { ok: false; errors: FieldError[] } {
  const errors: FieldError[] = [];
  const { approachRingKm, ...rest } = doc;
  const out: Doc = { ...rest, version: 1 };
  if (approachRingKm !== undefined) {
    if (typeof approachRingKm === "number" && Number.isFinite(approachRingKm)) {
      out.approachRingDepthM = approachRingKm * METRES_PER_KILOMETRE;
    } else {
      errors.push({
        path: "approachRingKm",
        message: `must be a finite number in km (format version 0; got ${describeValue(approachRingKm)})`,
      });
    }
  }
  if (Array.isArray(doc.posts)) {
    out.posts = doc.posts.map((post: unknown, i: number) => {
      if (!isRecord(post)) return post;
      const { lonLat, azimuthDeg, ...p } = post;
      const next: Doc = { ...p };
      if (lonLat !== undefined) {
        if (Array.isArray(lonLat) && lonLat.length === 2)
          next.position = { lonDeg: lonLat[0], latDeg: lonLat[1] };
        else {
          errors.push({
            path: `posts[${i}].lonLat`,
            message: `must be [lon, lat] (format version 0; got ${describeValue(lonLat)})`,
          });
        }
      }
      if (azimuthDeg !== undefined) next.boresightAzDeg = azimuthDeg;
      return next;
    });
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, doc: out };
}

/** MIGRATIONS[v] turns a version-v document into a version-(v+1) one. */
const MIGRATIONS: Record<number, Migration> = {
  0: migrateV0toV1,
};

/**
 * Bring a parsed JSON document to the current format version. Never throws on JSON-like input,
 * never modifies it. The result still needs the schema check.
 */
export function migratePlan(json: unknown): MigrationResult {
  if (!isRecord(json)) {
    return {
      ok: false,
      errors: [{ path: "(file)", message: `a plan must be a JSON object (got ${describeValue(json)})` }],
    };
  }
  const version = json.version;
  const supported = `this build reads plan format versions ${OLDEST_PLAN_VERSION} to ${PLAN_VERSION}`;
  if (version === undefined) {
    return { ok: false, errors: [{ path: "version", message: `is required (${supported})` }] };
  }
  if (typeof version !== "number" || !Number.isInteger(version)) {
    return {
      ok: false,
      errors: [
        { path: "version", message: `must be a whole number (got ${describeValue(version)}; ${supported})` },
      ],
    };
  }
  if (version > PLAN_VERSION) {
    return {
      ok: false,
      errors: [
        {
          path: "version",
          message: `this plan uses format version ${version}, newer than this build of Picket reads (up to ${PLAN_VERSION}); open it with a newer Picket — the file has not been changed`,
        },
      ],
    };
  }
  if (version < OLDEST_PLAN_VERSION) {
    return {
      ok: false,
      errors: [{ path: "version", message: `${version} is not a plan format version (${supported})` }],
    };
  }
  let doc: Doc = json;
  for (let v = version; v < PLAN_VERSION; v++) {
    const step = MIGRATIONS[v];
    const r = step(doc);
    if (!r.ok) return r;
    doc = r.doc;
  }
  return { ok: true, doc, fromVersion: version };
}
