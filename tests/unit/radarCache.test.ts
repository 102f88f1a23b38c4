import { describe, expect, it } from "vitest";
import type { RadarCoverage } from "../../src/coverage/coverage.ts";
import { evaluateSite, radarKey } from "../../src/coverage/evaluate.ts";
import { hashRaster, hashValue, RadarResultCache, stableStringify } from "../../src/coverage/radarCache.ts";
import { cellXY, demoRadar, frameOf, placed, roughGround, siteOf } from "./coverageFixtures.ts";

function threeRadarSite() {
  const f = frameOf(160, 160, 5);
  const ground = roughGround(f);
  const m = demoRadar("mossbee-58");
  const radars = [
    placed(m, cellXY(f, 40, 40), 140, { id: "a", boresightAzDeg: 135 }),
    placed(m, cellXY(f, 120, 40), 140, { id: "b", boresightAzDeg: 225 }),
    placed(demoRadar("zorvane-s24"), cellXY(f, 80, 120), 140, { id: "c", boresightAzDeg: 0 }),
  ];
  return siteOf(f, ground, radars);
}

describe("per-radar cache", () => {
  it("[RC1] changing one radar's tilt recomputes that radar only; the others come from the cache unchanged", async () => {
    const cache = new RadarResultCache<RadarCoverage>();
    const site = threeRadarSite();
    const first = await evaluateSite(site, { cache });
    expect(first.computedRadarIds.sort()).toEqual(["a", "b", "c"]);
    expect(cache.computed).toBe(3);

    const again = await evaluateSite(site, { cache });
    expect(again.computedRadarIds).toEqual([]);
    expect(again.cachedRadarIds.sort()).toEqual(["a", "b", "c"]);

    const moved = { ...site, radars: site.radars.map((r) => (r.id === "b" ? { ...r, tiltDeg: 5 } : r)) };
    const third = await evaluateSite(moved, { cache });
    expect(third.computedRadarIds).toEqual(["b"]);
    expect(cache.computed).toBe(4);
    // The unchanged radars are the very same results; the changed one differs.
    expect(third.radars[0]).toBe(first.radars[0]);
    expect(third.radars[2]).toBe(first.radars[2]);
    expect(third.radars[1]).not.toBe(first.radars[1]);
    // A full recomputation without the cache gives the same fused Pd.
    const fresh = await evaluateSite(moved);
    expect(Array.from(fresh.targets[0].heights[1].combinedPd)).toEqual(
      Array.from(third.targets[0].heights[1].combinedPd),
    );
  });

  it("[RC2] the key depends on everything the radar's result depends on", () => {
    const site = threeRadarSite();
    const base = radarKey(site, 0, "accurate");
    expect(radarKey(site, 0, "accurate")).toBe(base);
    expect(radarKey(site, 0, "fast")).not.toBe(base);
    const variants = [
      { ...site, heightsAglM: [10, 30] },
      { ...site, effectiveEarthFactor: 1 },
      { ...site, requirement: { ...site.requirement, pfa: 1e-5 } },
      { ...site, targets: [{ ...site.targets[0], rcsDbsm: -19 }] },
      { ...site, radars: [{ ...site.radars[0], x: site.radars[0].x + 1 }, ...site.radars.slice(1)] },
      {
        ...site,
        radars: [
          { ...site.radars[0], model: { ...site.radars[0].model, transmitter: { peakPowerW: 0.1 } } },
          ...site.radars.slice(1),
        ],
      },
    ];
    for (const v of variants) expect(radarKey(v, 0, "accurate")).not.toBe(base);
    // Another radar's change does not touch radar 0's key.
    const other = { ...site, radars: [site.radars[0], { ...site.radars[1], tiltDeg: 9 }, site.radars[2]] };
    expect(radarKey(other, 0, "accurate")).toBe(base);
    // One changed surface cell changes the terrain identity.
    const surface = site.surface.slice();
    surface[1234] += 0.5;
    expect(radarKey({ ...site, surface }, 0, "accurate")).not.toBe(base);
  });

  it("[RC3] stable text form: key order does not matter, NaN and Infinity stay distinct; raster hash sees one value", () => {
    expect(stableStringify({ b: 1, a: [1, 2] })).toBe(stableStringify({ a: [1, 2], b: 1 }));
    expect(hashValue({ x: Number.NaN })).not.toBe(hashValue({ x: null }));
    expect(hashValue({ x: Number.POSITIVE_INFINITY })).not.toBe(hashValue({ x: Number.NEGATIVE_INFINITY }));
    const a = new Float32Array(1000).fill(3);
    const b = a.slice();
    b[999] = 3.0001;
    expect(hashRaster(a)).not.toBe(hashRaster(b));
    expect(hashRaster(a)).toBe(hashRaster(a.slice()));
  });

  it("[RC4] the cache is bounded: the least recently used entry leaves first", () => {
    const c = new RadarResultCache<number>(2);
    c.set("a", 1);
    c.set("b", 2);
    expect(c.get("a")).toBe(1);
    c.set("c", 3);
    expect(c.has("b")).toBe(false);
    expect(c.has("a")).toBe(true);
    expect(c.size).toBe(2);
  });
});

describe("radar result cache groups and spares", () => {
  it("[RC5] keeps the newest entries of a group and hands the ones that left out as spares", () => {
    const c = new RadarResultCache<{ n: number }>(10, { perGroup: 2, spares: 1 });
    const v = [0, 1, 2, 3].map((n) => ({ n }));
    c.set("a0", v[0], "a");
    c.set("b0", { n: 9 }, "b");
    c.set("a1", v[1], "a");
    expect(c.takeSpare()).toBeUndefined();
    c.set("a2", v[2], "a");
    // The oldest of group a left; group b is untouched.
    expect(c.has("a0")).toBe(false);
    expect([c.has("a1"), c.has("a2"), c.has("b0")]).toEqual([true, true, true]);
    c.set("a3", v[3], "a");
    // At most one spare: the newest to leave.
    expect(c.takeSpare()).toBe(v[1]);
    expect(c.takeSpare()).toBeUndefined();
  });

  it("[RC6] an entry over the size bound becomes a spare too, and a cache without spares keeps none", () => {
    const c = new RadarResultCache<number>(2, { spares: 2 });
    c.set("a", 1);
    c.set("b", 2);
    c.set("c", 3);
    expect(c.takeSpare()).toBe(1);
    const plain = new RadarResultCache<number>(1);
    plain.set("a", 1);
    plain.set("b", 2);
    expect(plain.takeSpare()).toBeUndefined();
    c.set("d", 4);
    c.clear();
    expect(c.takeSpare()).toBeUndefined();
  });

  it("[RC7] a result computed ahead pushes no kept entry out, gives way to the next one (of any group), and joins its group when asked for", () => {
    const c = new RadarResultCache<{ n: number }>(10, { perGroup: 2, spares: 2 });
    const v = [0, 1, 2, 3].map((n) => ({ n }));
    c.set("a0", v[0], "a");
    c.set("a1", v[1], "a");
    // Two places passed while dragging: the first gives way to the second (a spare), the group keeps both entries.
    c.setAhead("x", v[2], "a");
    c.setAhead("y", v[3], "a");
    expect(c.takeSpare()).toBe(v[2]);
    expect([c.has("a0"), c.has("a1"), c.has("x"), c.has("y")]).toEqual([true, true, false, true]);
    // Dropped at the second place: the release takes it, and it joins group a as the newest entry.
    expect(c.get("y")).toBe(v[3]);
    expect([c.has("a0"), c.has("a1"), c.has("y")]).toEqual([false, true, true]);
    expect(c.takeSpare()).toBe(v[0]);
    // Asked for again, it is an ordinary entry.
    expect(c.get("y")).toBe(v[3]);
    // One result ahead at a time, whichever post: another post's makes the first a spare.
    const w = [4, 5, 6, 7].map((n) => ({ n }));
    c.set("b0", w[3], "b");
    c.setAhead("p", w[0], "a");
    c.setAhead("q", w[1], "b");
    expect([c.has("p"), c.has("q")]).toEqual([false, true]);
    expect(c.takeSpare()).toBe(w[0]);
    // A post with no kept result yet (a cold cache): its result is an entry at once, not held apart.
    c.setAhead("r", w[2], "c");
    c.setAhead("q2", w[0], "b");
    expect([c.has("r"), c.has("q"), c.has("q2")]).toEqual([true, false, true]);
  });
});
