import kinks from "@turf/kinks";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { firstCrossing } from "../../src/io/segmentCrossings.ts";

type Ring = number[][];

function close(points: Ring): Ring {
  const out: Ring = [];
  for (const p of points) {
    const q = out[out.length - 1];
    if (!q || q[0] !== p[0] || q[1] !== p[1]) out.push(p);
  }
  if (out.length > 1 && out[0][0] === out[out.length - 1][0] && out[0][1] === out[out.length - 1][1])
    out.pop();
  return [...out, out[0]];
}

/** Uniform in [0, 1] on a 10⁻⁶ lattice (fc.double is uniform over representable doubles, mostly tiny). */
const unit = fc.noBias(fc.integer({ min: 0, max: 1_000_000 })).map((i) => i / 1_000_000);

/** Few random vertices: simple or crossing about equally often. */
const randomRingArb = fc
  // Unbiased doubles: fast-check's default bias towards 0 and 1 would put most vertices on one line.
  .array(fc.tuple(unit, unit), { minLength: 3, maxLength: 7 })
  .map((pts) => close(pts.map(([x, y]) => [16 + x * 0.01, 62 + y * 0.01])));

/** A star-shaped ring (vertices by angle, random radii): simple; with two vertices swapped, usually not. */
const starRingArb = fc
  .tuple(fc.array(fc.tuple(unit, unit), { minLength: 3, maxLength: 40 }), fc.boolean(), fc.nat(), unit, unit)
  .map(([pts, swap, at, cx, cy]) => {
    const v = pts
      .map(([a, r]) => [a * 2 * Math.PI, 0.2 + r])
      .sort((p, q) => p[0] - q[0])
      .map(([a, r]) => [16 + cx * 0.01 + 0.002 * r * Math.cos(a), 62 + cy * 0.01 + 0.002 * r * Math.sin(a)]);
    if (swap) {
      const i = at % (v.length - 1);
      [v[i], v[i + 1]] = [v[i + 1], v[i]];
    }
    return close(v);
  });

const ringArb = fc.oneof(randomRingArb, starRingArb).filter((r) => r.length >= 4 && generalPosition(r));

/**
 * No repeated vertex and no three vertices on one line: the generic case, where "crossing" has one
 * meaning. Degenerate contacts (touching, collinear overlap) are tested by hand below, because
 * kinks and this module differ on purpose there (kinks ignores some contacts that make a ring invalid).
 */
function generalPosition(ring: Ring): boolean {
  const v = ring.slice(0, -1);
  for (let i = 0; i < v.length; i++) {
    for (let j = i + 1; j < v.length; j++) {
      if (v[i][0] === v[j][0] && v[i][1] === v[j][1]) return false;
      for (let k = j + 1; k < v.length; k++) {
        const o = (v[j][0] - v[i][0]) * (v[k][1] - v[i][1]) - (v[j][1] - v[i][1]) * (v[k][0] - v[i][0]);
        if (Math.abs(o) < 1e-14) return false;
      }
    }
  }
  return true;
}

/** A simple star-shaped ring of n vertices (radius varies with angle, never crosses itself). */
function star(n: number, cx = 0, cy = 0, radius = 1): Ring {
  const ring: Ring = [];
  for (let i = 0; i < n; i++) {
    const a = (2 * Math.PI * i) / n;
    const r = radius * (1 + 0.3 * Math.sin(37 * a));
    ring.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
  }
  ring.push(ring[0]);
  return ring;
}

describe("edge crossings of polygon rings", () => {
  it("[PF3] agrees with @turf/kinks on random rings (reference implementation)", () => {
    const seen = { crossing: 0, simple: 0 };
    fc.assert(
      fc.property(ringArb, (ring) => {
        const turf = kinks({ type: "Polygon", coordinates: [ring] }).features.length > 0;
        expect(firstCrossing([ring]) !== null).toBe(turf);
        seen[turf ? "crossing" : "simple"]++;
      }),
      { numRuns: 3000 },
    );
    // Both outcomes were exercised.
    expect(seen.crossing).toBeGreaterThan(100);
    expect(seen.simple).toBeGreaterThan(100);
  });

  it("[PF3] agrees with @turf/kinks on random pairs of rings", () => {
    let tested = 0;
    fc.assert(
      fc.property(ringArb, ringArb, (a, b) => {
        if (!generalPosition([...a.slice(0, -1), ...b.slice(0, -1), a[0]])) return;
        const turf = kinks({ type: "Polygon", coordinates: [a, b] }).features.length > 0;
        expect(firstCrossing([a, b]) !== null).toBe(turf);
        tested++;
      }),
      { numRuns: 1500 },
    );
    expect(tested).toBeGreaterThan(1000);
  });

  it("[PF3] degenerate contacts count as crossings; consecutive edges meeting at their vertex do not", () => {
    const square = [
      [0, 0],
      [2, 0],
      [2, 2],
      [0, 2],
      [0, 0],
    ];
    expect(firstCrossing([square])).toBeNull();
    // A vertex lying on a non-adjacent edge (T contact).
    expect(
      firstCrossing([
        [
          [0, 0],
          [2, 0],
          [2, 2],
          [1, 0],
          [0, 2],
          [0, 0],
        ],
      ])?.point,
    ).toEqual([1, 0]);
    // The ring passes twice through one vertex (figure eight).
    expect(
      firstCrossing([
        [
          [0, 0],
          [1, 1],
          [2, 0],
          [2, 2],
          [1, 1],
          [0, 2],
          [0, 0],
        ],
      ]),
    ).not.toBeNull();
    // Doubling back along the previous edge (spike), also across the closing vertex.
    expect(
      firstCrossing([
        [
          [0, 0],
          [2, 0],
          [1, 0],
          [1, 1],
          [0, 0],
        ],
      ]),
    ).not.toBeNull();
    expect(
      firstCrossing([
        [
          [1, 0],
          [2, 0],
          [2, 2],
          [0, 0],
          [1, 0],
        ],
      ]),
    ).toBeNull();
    expect(
      firstCrossing([
        [
          [1, 0],
          [2, 0],
          [2, 2],
          [0, 2],
          [0, 0],
          [3, 0],
          [1, 0],
        ],
      ]),
    ).not.toBeNull();
    // A triangle has only consecutive edges.
    expect(
      firstCrossing([
        [
          [0, 0],
          [1, 0],
          [0, 1],
          [0, 0],
        ],
      ]),
    ).toBeNull();
    // A hole touching the outline at one point.
    const hole = [
      [0, 1],
      [1, 0.5],
      [1, 1.5],
      [0, 1],
    ];
    expect(firstCrossing([square, hole])).toMatchObject({ ringA: 0, ringB: 1, point: [0, 1] });
  });

  it("[PF3] a 100 000-vertex ring is checked exactly (no crossing; one injected crossing is found)", () => {
    const big = star(100_000);
    expect(firstCrossing([big])).toBeNull();
    const broken = big.map((p) => [...p]);
    // Swap two neighbouring vertices far from the start: the two edges around them now cross.
    const i = 54_321;
    [broken[i], broken[i + 1]] = [broken[i + 1], broken[i]];
    const hit = firstCrossing([broken]);
    expect(hit).not.toBeNull();
    expect(Math.hypot(hit!.point[0] - big[i][0], hit!.point[1] - big[i][1])).toBeLessThan(1e-3);
  });
});
