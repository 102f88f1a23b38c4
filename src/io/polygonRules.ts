/**
 * Validity rules for GeoJSON polygons drawn or imported by users (RFC 7946 §3.1.6): each ring
 * encloses an area, no ring crosses itself, rings do not cross each other, and holes lie inside
 * their outer ring. Coordinates are WGS84 lon/lat degrees. Crossings are found by
 * segmentCrossings.ts (checked against @turf/kinks in the tests, and near-linear where kinks is
 * quadratic in the vertex count).
 */
import booleanPointInPolygon from "@turf/boolean-point-in-polygon";
import type { Position } from "./planSchema.ts";
import { firstCrossing } from "./segmentCrossings.ts";

export interface PolygonProblem {
  /** Path below the geometry, e.g. ["coordinates", 0] or ["coordinates", 1, 2]. */
  path: (string | number)[];
  message: string;
}

function dedupe(ring: Position[]): Position[] {
  const out: Position[] = [];
  for (const p of ring) {
    const q = out[out.length - 1];
    if (!q || q[0] !== p[0] || q[1] !== p[1]) out.push([p[0], p[1]]);
  }
  return out;
}

function near(p: number[]): string {
  return `near lon ${p[0].toFixed(6)}, lat ${p[1].toFixed(6)}`;
}

/** A ring the schema accepted: closed, at least 4 positions, finite lon/lat in range. */
function wellFormed(ring: unknown): ring is Position[] {
  if (!Array.isArray(ring) || ring.length < 4) return false;
  for (const p of ring) {
    if (!Array.isArray(p) || p.length < 2) return false;
    if (!(Math.abs(p[0]) <= 180 && Math.abs(p[1]) <= 90)) return false;
  }
  const a = ring[0];
  const b = ring[ring.length - 1];
  return a[0] === b[0] && a[1] === b[1];
}

/** True when every corner lies on the line through the first two distinct ones. */
function collinear(ring: Position[]): boolean {
  const a = ring[0];
  const b = ring[1];
  for (let i = 2; i < ring.length; i++) {
    const c = ring[i];
    if ((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]) !== 0) return false;
  }
  return true;
}

/**
 * Problems of one polygon (outer ring then holes); `base` is the path of its coordinates array.
 * Rings that fail the schema's own checks (open, too short, bad numbers) are left to the schema.
 */
export function polygonProblems(rings: unknown, base: (string | number)[]): PolygonProblem[] {
  if (!Array.isArray(rings)) return [];
  const problems: PolygonProblem[] = [];
  const clean: Position[][] = [];
  let skipped = false;
  rings.forEach((ring: unknown, r: number) => {
    if (!wellFormed(ring)) {
      skipped = true;
      return;
    }
    const d = dedupe(ring);
    if (d.length < 4) {
      problems.push({ path: [...base, r], message: "the ring has fewer than 3 distinct corners" });
      return;
    }
    if (collinear(d)) {
      problems.push({ path: [...base, r], message: "the ring encloses no area (all corners on one line)" });
      return;
    }
    const self = firstCrossing([d]);
    if (self) {
      problems.push({ path: [...base, r], message: `the ring crosses itself ${near(self.point)}` });
      return;
    }
    clean.push(d);
  });
  if (skipped || problems.length > 0 || clean.length < 2) return problems;
  const cross = firstCrossing(clean);
  if (cross) return [{ path: base, message: `a hole crosses another ring ${near(cross.point)}` }];
  const outer = { type: "Polygon" as const, coordinates: [clean[0]] };
  for (let r = 1; r < clean.length; r++) {
    if (!booleanPointInPolygon(clean[r][0], outer)) {
      problems.push({ path: [...base, r], message: "the hole lies outside the outer ring" });
    }
  }
  return problems;
}

/** The first problem of a protected area's geometry (Polygon or MultiPolygon), or null when it is valid. */
export function areaGeometryProblem(
  g: { type: "Polygon"; coordinates: unknown } | { type: "MultiPolygon"; coordinates: unknown },
): string | null {
  const parts = g.type === "Polygon" ? [g.coordinates] : Array.isArray(g.coordinates) ? g.coordinates : [];
  for (const rings of parts) {
    const [first] = polygonProblems(rings, []);
    if (first) return first.message;
  }
  return null;
}
