// @vitest-environment jsdom

import { contours } from "d3-contour";
import { describe, expect, it, vi } from "vitest";
import type { Grid, GridFrame } from "../../src/coverage/grid";
import { GapLayer, OUTLINE_BATCH_VERTICES } from "../../src/map/gapLayer";
import { hillshadeIndices, hillshadeIndicesInSlices } from "../../src/map/hillshade";
import L from "../../src/map/leaflet";
import { forwardTo } from "../../src/map/pixelToGrid";
import { RasterLayer } from "../../src/map/rasterLayer";
import { importKindOf } from "../../src/ui/import/importFiles";
import { layerScale, PD_SHOWN_FROM, scaleIndices, scaleIndicesInSlices } from "../../src/ui/layerPaint";
import { gapLabelsXY, gapOutlinesXY } from "../../src/workers/gapContours";

const frame: GridFrame = {
  width: 20,
  height: 10,
  originX: 1000,
  originY: 5000,
  cellSizeM: 5,
  crs: "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs",
};

/**
 * Runs both gap functions on a larger grid full of gaps first: they keep their work arrays from call
 * to call, and what a larger call left there must not reach a smaller one.
 */
function dirtyWorkArrays(): void {
  const big = { ...frame, width: 64, height: 48 };
  const gap = new Uint8Array(big.width * big.height).map((_, i) => (i % 7 < 4 ? 1 : 0));
  gapOutlinesXY(gap, big);
  gapLabelsXY(gap, big);
}

describe("gap shapes", () => {
  it("label each 8-connected gap with its exact area (cell count × cell area), largest first", () => {
    dirtyWorkArrays();
    const gap = new Uint8Array(frame.width * frame.height);
    // A 4 × 3 block with a 1-cell hole, a 2 × 1 block, and a cell touching it diagonally (same gap).
    for (let r = 1; r <= 3; r++) for (let c = 2; c <= 5; c++) gap[r * frame.width + c] = 1;
    gap[2 * frame.width + 3] = 0;
    gap[7 * frame.width + 10] = 1;
    gap[7 * frame.width + 11] = 1;
    gap[8 * frame.width + 12] = 1;
    const labels = gapLabelsXY(gap, frame);
    expect(labels.map((l) => l.areaM2)).toEqual([11 * 25, 3 * 25]);
    // The label sits on a gap cell's centre.
    const col = (labels[0].x - frame.originX) / frame.cellSizeM - 0.5;
    const row = (frame.originY - labels[0].y) / frame.cellSizeM - 0.5;
    expect(gap[row * frame.width + col]).toBe(1);
  });

  it("outline the gaps in grid metres inside the gap's cell edges, with holes", () => {
    const gap = new Uint8Array(frame.width * frame.height);
    for (let r = 1; r <= 3; r++) for (let c = 2; c <= 5; c++) gap[r * frame.width + c] = 1;
    gap[2 * frame.width + 3] = 0;
    const [outline] = gapOutlinesXY(gap, frame);
    expect(outline.rings).toHaveLength(2);
    const xs = Array.from(outline.rings[0]).filter((_, i) => i % 2 === 0);
    const ys = Array.from(outline.rings[0]).filter((_, i) => i % 2 === 1);
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(1010);
    expect(Math.max(...xs)).toBeLessThanOrEqual(1030);
    expect(Math.max(...ys)).toBeLessThanOrEqual(4995);
    expect(Math.min(...ys)).toBeGreaterThanOrEqual(4980);
  });

  it("outlines contoured on the gaps' bounding box equal d3-contour on the whole grid", () => {
    dirtyWorkArrays();
    const gap = new Uint8Array(frame.width * frame.height);
    // Two blobs away from the grid edges and one on the eastern edge.
    for (let r = 3; r <= 6; r++) for (let c = 7; c <= 9; c++) gap[r * frame.width + c] = 1;
    gap[5 * frame.width + 12] = 1;
    for (let r = 0; r <= 2; r++) gap[r * frame.width + 19] = 1;
    const values = Array.from(gap);
    const [whole] = contours().size([frame.width, frame.height]).thresholds([0.5]).smooth(false)(values);
    const expected = whole.coordinates
      .map((polygon) =>
        polygon.map((ring) =>
          ring.flatMap(([c, r]) => [
            frame.originX + c * frame.cellSizeM,
            frame.originY - r * frame.cellSizeM,
          ]),
        ),
      )
      .sort((a, b) => b[0].length - a[0].length);
    const ours = gapOutlinesXY(gap, frame).map((p) => p.rings.map((ring) => Array.from(ring)));
    expect(ours).toEqual(expected);
  });

  it("finds nothing without gaps", () => {
    const none = new Uint8Array(frame.width * frame.height);
    expect(gapOutlinesXY(none, frame)).toEqual([]);
    expect(gapLabelsXY(none, frame)).toEqual([]);
  });
});

describe("hillshade", () => {
  const grid = (f: (c: number, r: number) => number): Grid => {
    const data = new Float32Array(frame.width * frame.height);
    for (let r = 0; r < frame.height; r++)
      for (let c = 0; c < frame.width; c++) data[r * frame.width + c] = f(c, r);
    return { ...frame, data };
  };
  it("shades flat ground uniformly at cos(45°) of full light, nodata transparent", () => {
    const g = grid(() => 100);
    g.data[5] = Number.NaN;
    const s = hillshadeIndices(g);
    expect(s[5]).toBe(-1);
    expect(s[50]).toBe(Math.round(Math.cos(Math.PI / 4) * 255));
  });
  it("lights a slope facing north-west more than one facing south-east", () => {
    // Height rising to the south-east: the surface faces north-west, towards the light.
    const nw = hillshadeIndices(grid((c, r) => 2 * (c + r)));
    const se = hillshadeIndices(grid((c, r) => -2 * (c + r)));
    const i = 5 * frame.width + 10;
    expect(nw[i]).toBeGreaterThan(se[i]);
  });
  it("shades in slices to the same bytes, and stops when cancelled", async () => {
    const g = grid((c, r) => 40 * Math.sin(c / 3) + 25 * Math.cos(r / 2));
    g.data[17] = Number.NaN;
    expect(Array.from((await hillshadeIndicesInSlices(g, () => false)) ?? [])).toEqual(
      Array.from(hillshadeIndices(g)),
    );
    expect(await hillshadeIndicesInSlices(g, () => true)).toBeNull();
  });
});

describe("layer scales and import kinds", () => {
  it("leaves Pd below the shown threshold and NaN transparent; overlap 0 transparent", () => {
    const pd = layerScale("combined", 3, 100);
    expect(pd.toIndex(0)).toBe(-1);
    expect(pd.toIndex(PD_SHOWN_FROM / 2)).toBe(-1);
    expect(pd.toIndex(1)).toBe(255);
    expect(pd.title).toMatch(/Pd/);
    const ov = layerScale("overlap", 3, 100);
    expect(ov.toIndex(0)).toBe(-1);
    expect(ov.toIndex(2)).toBe(2);
    expect(ov.stops.map((s) => s.label)).toEqual(["1", "2", "3"]);
    const low = layerScale("lowest", 3, 100);
    expect(low.toIndex(Number.POSITIVE_INFINITY)).toBe(-1);
    expect(low.toIndex(50)).toBe(128);
    expect(low.title).toMatch(/m above ground/);
    // The legend says what no colour means, and that the ramp's top colour holds above its top.
    expect(pd.uncoloured).toBe("No colour: Pd below 0.01 (nothing detected)");
    expect(ov.uncoloured).toMatch(/no radar meets the required Pd/);
    expect(low.uncoloured).toMatch(/range|terrain data/);
    expect(low.stops.map((s) => s.label)).toEqual(["0 m", "25 m", "50 m", "75 m", "≥ 100 m"]);
  });
  it("turns whole rasters into the same indices as value by value, for every layer, at once or in slices", async () => {
    const values = Float32Array.from([
      Number.NaN,
      Number.NEGATIVE_INFINITY,
      Number.POSITIVE_INFINITY,
      -1,
      0,
      PD_SHOWN_FROM / 2,
      PD_SHOWN_FROM,
      0.5,
      1 / 510,
      0.999,
      1,
      1.5,
      2,
      3,
      7,
      119.9,
      120,
      240,
      ...Array.from({ length: 20_000 }, (_, k) => Math.sin(k * 12.9898) * 150),
    ]);
    for (const kind of ["combined", "single", "overlap", "lowest"] as const) {
      const scale = layerScale(kind, 4, 120);
      // As the layer stores them: Int16 (an overlap count is an integer; a fraction truncates alike).
      const want = Array.from(Int16Array.from(values, (v) => scale.toIndex(v)));
      expect(Array.from(scaleIndices(scale, values))).toEqual(want);
      // Into an array given (a drag preview's, used again): every cell rewritten.
      const reused = new Int16Array(values.length).fill(999);
      expect(scaleIndices(scale, values, reused)).toBe(reused);
      expect(Array.from(reused)).toEqual(want);
      // In slices (here of 4096 cells, the least, as the budget is 0), the same.
      const sliced = await scaleIndicesInSlices(scale, values, () => false, 0);
      expect(Array.from(sliced ?? [])).toEqual(want);
    }
    // One table object per class count: an unchanged overlap layer is not repainted.
    expect(layerScale("overlap", 4, 120).table).toBe(layerScale("overlap", 4, 60).table);
  });

  it("tells the kind of an imported file from its name and head", () => {
    expect(importKindOf("DEM.TIF")).toBe("dem-geotiff");
    expect(importKindOf("N47E015.hgt")).toBe("dem-hgt");
    expect(importKindOf("site.asc")).toBe("dem-asc");
    expect(importKindOf("posts.csv")).toBe("posts");
    expect(importKindOf("bundle.zip")).toBe("bundle");
    expect(importKindOf("roofs.kmz")).toBe("buildings");
    expect(importKindOf("export.osm")).toBe("buildings");
    expect(importKindOf("plan.json", '{ "version": 1, "site": {}, "posts": [] }')).toBe("plan");
    expect(importKindOf("houses.json", '{ "type": "FeatureCollection" }')).toBe("buildings");
    expect(importKindOf("notes.docx")).toBe("unknown");
  });
});

describe("repaints", () => {
  /** A raster layer with one tile on record, as Leaflet keeps them, and its repaint queue. */
  function withTile<T extends RasterLayer>(layer: T): { layer: T; queued: () => number } {
    const el = document.createElement("canvas");
    document.body.appendChild(el);
    const internals = layer as unknown as { _tiles: object; pending: unknown[] };
    internals._tiles = { "0:0:1": { el, coords: { x: 0, y: 0, z: 1 }, current: true } };
    return {
      layer,
      queued: () => {
        const n = internals.pending.length;
        internals.pending.length = 0;
        return n;
      },
    };
  }
  const forward = forwardTo(frame.crs);

  it("a raster set again with the same indices, table and frame is not repainted; a new one is", () => {
    const { layer, queued } = withTile(new RasterLayer());
    const scale = layerScale("combined", 3, 120);
    const indices = new Int16Array(frame.width * frame.height).fill(7);
    layer.setPaint({ frame, forward, indices, table: scale.table, pattern: "fill" });
    expect(queued()).toBe(1);
    layer.setPaint({ frame, forward, indices, table: scale.table, pattern: "fill" });
    expect(queued()).toBe(0);
    layer.setPaint({ frame, forward, indices: indices.slice(), table: scale.table, pattern: "fill" });
    expect(queued()).toBe(1);
    layer.setPaint({
      frame: { ...frame, originX: frame.originX + 5 },
      forward,
      indices,
      table: scale.table,
      pattern: "fill",
    });
    expect(queued()).toBe(1);
  });

  it("layers repaint in turn within one time budget per animation frame, shared by all of them", async () => {
    // The frames the tests before asked for run first.
    await new Promise((r) => setTimeout(r, 20));
    const frames: (() => void)[] = [];
    vi.stubGlobal("requestAnimationFrame", (fn: () => void) => frames.push(fn));
    // Each reading of the clock is 3 ms later: the 8 ms budget of a frame allows two tiles.
    let clock = 0;
    const now = vi.spyOn(performance, "now").mockImplementation(() => (clock += 3));
    try {
      const layers = [new RasterLayer(), new RasterLayer()];
      const pending = layers.map((layer) => {
        const tiles: Record<string, object> = {};
        for (let k = 0; k < 3; k++) {
          const el = document.createElement("canvas");
          document.body.appendChild(el);
          tiles[`${k}:0:1`] = { el, coords: { x: k, y: 0, z: 1 }, current: true };
        }
        const internals = layer as unknown as { _tiles: object; pending: unknown[] };
        internals._tiles = tiles;
        return () => internals.pending.length;
      });
      const scale = layerScale("combined", 3, 120);
      const indices = new Int16Array(frame.width * frame.height).fill(7);
      for (const layer of layers)
        layer.setPaint({ frame, forward, indices, table: scale.table, pattern: "fill" });
      // One frame asked for both layers.
      expect(frames).toHaveLength(1);
      frames.shift()?.();
      // One tile of each, not two of the first: the second layer is not left waiting.
      expect(pending.map((p) => p())).toEqual([2, 2]);
      expect(frames).toHaveLength(1);
      frames.shift()?.();
      frames.shift()?.();
      expect(pending.map((p) => p())).toEqual([0, 0]);
      // Nothing left: no further frame is asked for.
      frames.shift()?.();
      expect(frames).toHaveLength(0);
    } finally {
      now.mockRestore();
      vi.unstubAllGlobals();
    }
  });

  it("the same gap raster with its outlines added keeps its hatching", () => {
    const gaps = new GapLayer();
    const hatch = (gaps as unknown as { hatch: RasterLayer }).hatch;
    const { queued } = withTile(hatch);
    const gap = new Uint8Array(frame.width * frame.height);
    gap[3] = 1;
    gaps.setGaps(frame, forward, gap, null);
    expect(queued()).toBe(1);
    gaps.setGaps(frame, forward, gap, { shapes: { outlines: [], labels: [] }, toLonLat: (x, y) => [x, y] });
    expect(queued()).toBe(0);
    gaps.setGaps(frame, forward, gap.slice(), null);
    expect(queued()).toBe(1);
  });

  it("draws the gap outlines as a few multipolygons over a few tasks, with a label per gap", async () => {
    const gaps = new GapLayer();
    const frame = { crs: "EPSG:32632", originX: 0, originY: 100, cellSizeM: 10, width: 10, height: 10 };
    // Grid metres to degrees: 1 m = 1e-5 degrees from (8° E, 47° N), enough for the layer.
    const toLonLat = (x: number, y: number): [number, number] => [8 + x * 1e-5, 47 + y * 1e-5];
    const square = (x: number, y: number, side: number) =>
      new Float64Array([x, y, x + side, y, x + side, y + side, x, y + side, x, y]);
    // Three gaps, the second with a hole: polygons of 1, 2 and 1 rings, 5 vertices a ring.
    const small = {
      outlines: [
        { rings: [square(0, 0, 10)] },
        { rings: [square(20, 0, 30), square(30, 10, 5)] },
        { rings: [square(60, 0, 10)] },
      ],
      labels: [
        { x: 5, y: 5, areaM2: 800 },
        { x: 25, y: 5, areaM2: 300 },
      ],
    };
    const group = (gaps as unknown as { outlines: L.LayerGroup }).outlines;
    const polygonsOf = () => group.getLayers().filter((l): l is L.Polygon => l instanceof L.Polygon);
    gaps.setGaps(frame, forwardTo(frame.crs), new Uint8Array(100), { shapes: small, toLonLat });
    await gaps.whenOutlined();
    expect(polygonsOf()).toHaveLength(1);
    const rings = polygonsOf()[0].getLatLngs() as L.LatLng[][][];
    expect(rings.map((p) => p.length)).toEqual([1, 2, 1]);
    expect(rings[0][0][1].lng).toBeCloseTo(8 + 10e-5, 9);
    expect(group.getLayers().filter((l) => l instanceof L.Marker)).toHaveLength(2);
    // Many gaps: the first batch at once, the rest in later tasks, each batch near the vertex budget.
    const count = Math.ceil((3 * OUTLINE_BATCH_VERTICES) / 5);
    const many = {
      outlines: Array.from({ length: count }, (_, k) => ({ rings: [square(k, 0, 1)] })),
      labels: [],
    };
    gaps.setGaps(frame, forwardTo(frame.crs), new Uint8Array(100), { shapes: many, toLonLat });
    expect(polygonsOf()).toHaveLength(1);
    await gaps.whenOutlined();
    const batches = polygonsOf().map((p) => (p.getLatLngs() as L.LatLng[][][]).length);
    expect(batches.length).toBeGreaterThanOrEqual(3);
    expect(batches.reduce((a, b) => a + b, 0)).toBe(count);
    // A new set of gaps drops the batches still pending for the old one.
    gaps.setGaps(frame, forwardTo(frame.crs), new Uint8Array(100), { shapes: many, toLonLat });
    gaps.setGaps(frame, forwardTo(frame.crs), new Uint8Array(100), { shapes: small, toLonLat });
    await new Promise((r) => setTimeout(r, 20));
    expect(polygonsOf()).toHaveLength(1);
  });
});
