/**
 * Validity rules for GeoJSON polygons drawn or imported by users (RFC 7946 §3.1.6): each ring
 * encloses an area, no ring crosses itself (turf kinks), rings do not cross each other, and
 * holes lie inside their outer ring. Coordinates are WGS84 lon/lat degrees.
 */
import booleanPointInPolygon from "@turf/boolean-point-in-polygon";
import kinks from "@turf/kinks";
import type { Position } from "./planSchema.ts";

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

/** Twice the signed area of a closed ring in degree² (shoelace); only its sign and zero matter here. */
function twiceSignedAreaDeg2(ring: Position[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s;
}

function near(p: number[]): string {
  return `near lon ${p[0].toFixed(6)}, lat ${p[1].toFixed(6)}`;
}

/** Problems of one polygon (outer ring then holes); `base` is the path of its coordinates array. */
export function polygonProblems(rings: Position[][], base: (string | number)[]): PolygonProblem[] {
  const problems: PolygonProblem[] = [];
  const clean: Position[][] = [];
  rings.forEach((ring, r) => {
    const d = dedupe(ring);
    if (d.length < 4) {
      problems.push({ path: [...base, r], message: "the ring has fewer than 3 distinct corners" });
      return;
    }
    if (twiceSignedAreaDeg2(d) === 0) {
      problems.push({ path: [...base, r], message: "the ring encloses no area (all corners on one line)" });
      return;
    }
    const k = kinks({ type: "Polygon", coordinates: [d] });
    if (k.features.length > 0) {
      problems.push({
        path: [...base, r],
        message: `the ring crosses itself ${near(k.features[0].geometry.coordinates)}`,
      });
      return;
    }
    clean.push(d);
  });
  if (problems.length > 0 || clean.length < 2) return problems;
  const k = kinks({ type: "Polygon", coordinates: clean });
  if (k.features.length > 0) {
    return [
      {
        path: base,
        message: `a hole crosses another ring ${near(k.features[0].geometry.coordinates)}`,
      },
    ];
  }
  const outer = { type: "Polygon" as const, coordinates: [clean[0]] };
  for (let r = 1; r < clean.length; r++) {
    if (!booleanPointInPolygon(clean[r][0], outer)) {
      problems.push({ path: [...base, r], message: "the hole lies outside the outer ring" });
    }
  }
  return problems;
}
