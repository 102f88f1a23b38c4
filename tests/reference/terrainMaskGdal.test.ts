/**
 * Masking against GDAL's gdal_viewshed (GDAL 3.6.2, Debian gdal-bin), on the committed fixtures made by
 * tests/fixtures/viewshed/gen_viewshed.py: visible/hidden for targets 0, 10 and 50 m above the surface
 * (-tz), and the lowest visible height (-om GROUND). Rule TM9 in docs/model-spec.md.
 */

import { readFile } from "node:fs/promises";
import { fileURLToPath } from "node:url";
import { fromArrayBuffer } from "geotiff";
import { beforeAll, describe, expect, it } from "vitest";
import type { Grid } from "../../src/coverage/grid.ts";
import { rayMarchHorizon } from "../../src/coverage/rayMarch.ts";
import {
  computeHorizon,
  type HorizonResult,
  lowestVisibleHeightAglM,
  type MaskInput,
  type MaskMode,
  visibleMask,
} from "../../src/coverage/terrainMask.ts";

const DIR = fileURLToPath(new URL("../fixtures/viewshed/", import.meta.url));

interface Case {
  name: string;
  dem: string;
  width: number;
  height: number;
  cellSizeM: number;
  originX: number;
  originY: number;
  observerX: number;
  observerY: number;
  observerHeightAboveSurfaceM: number;
  effectiveEarthFactor: number | "Infinity";
  visible: Record<string, string>;
  lowestVisibleHeight: string;
}

async function readBand(file: string): Promise<Float32Array> {
  const buf = await readFile(DIR + file);
  const tiff = await fromArrayBuffer(buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength));
  const img = await tiff.getImage();
  const [band] = (await img.readRasters()) as unknown as ArrayLike<number>[];
  return Float32Array.from(band);
}

interface Loaded {
  c: Case;
  surface: Grid;
  vis: Record<string, Float32Array>;
  ground: Float32Array;
}

/** Share of cells where our visibility equals GDAL's. */
function agreement(ours: Uint8Array, gdal: Float32Array): number {
  let same = 0;
  for (let i = 0; i < ours.length; i++) if ((gdal[i] > 0 ? 1 : 0) === ours[i]) same++;
  return same / ours.length;
}

function quantile(values: number[], p: number): number {
  const v = values.filter((x) => !Number.isNaN(x)).sort((a, b) => a - b);
  return v[Math.min(v.length - 1, Math.floor(p * v.length))];
}

const cases: Loaded[] = [];
beforeAll(async () => {
  const manifest = JSON.parse(await readFile(DIR + "manifest.json", "utf8")) as { cases: Case[] };
  for (const c of manifest.cases) {
    const data = await readBand(c.dem);
    const surface: Grid = {
      data,
      width: c.width,
      height: c.height,
      originX: c.originX,
      originY: c.originY,
      cellSizeM: c.cellSizeM,
      crs: "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs",
    };
    const vis: Record<string, Float32Array> = {};
    for (const [t, f] of Object.entries(c.visible)) vis[t] = await readBand(f);
    cases.push({ c, surface, vis, ground: await readBand(c.lowestVisibleHeight) });
  }
});

function inputOf(l: Loaded, mode: MaskMode): MaskInput {
  const col = Math.floor((l.c.observerX - l.c.originX) / l.c.cellSizeM);
  const row = Math.floor((l.c.originY - l.c.observerY) / l.c.cellSizeM);
  return {
    surface: l.surface,
    observerX: l.c.observerX,
    observerY: l.c.observerY,
    antennaHeightAslM: l.surface.data[row * l.c.width + col] + l.c.observerHeightAboveSurfaceM,
    effectiveEarthFactor:
      l.c.effectiveEarthFactor === "Infinity" ? Number.POSITIVE_INFINITY : l.c.effectiveEarthFactor,
    mode,
  };
}

/** Measured agreement, printed so that docs/model-spec.md can quote it. */
const report: string[] = [];

describe("[TM9] masking agrees with gdal_viewshed (GDAL 3.6.2) on the committed fixtures", () => {
  // Fast mode is the same reference-plane interpolation as GDAL's default (Wang et al. 2000, edge mode):
  // only float rounding at exact ties can differ, so ≥ 99.5 % is required (the bound).
  // Accurate mode samples each sight line like R3 and so departs from GDAL's approximation on purpose
  // (see the R3 comparison below): its bound (≥ 92 %, measured 93.2–99.99 %) only guards against gross
  // errors; the measured figures are in docs/model-spec.md.
  for (const [mode, bound] of [
    ["fast", 0.995],
    ["accurate", 0.92],
  ] as const) {
    for (const t of [0, 10, 50]) {
      it(`${mode} mode: visible/hidden at ${t} m above the surface matches on ≥ ${bound * 100} % of cells`, () => {
        expect(cases.length).toBe(4);
        for (const l of cases) {
          const input = inputOf(l, mode);
          const h: HorizonResult = computeHorizon(input);
          const a = agreement(visibleMask(h, l.surface, input, t), l.vis[String(t)]);
          report.push(`${mode} ${l.c.name} ${t} m: ${(a * 100).toFixed(2)} %`);
          expect(a, `${l.c.name}`).toBeGreaterThanOrEqual(bound);
        }
      });
    }
    it(`${mode} mode: lowest visible height matches -om GROUND`, () => {
      for (const l of cases) {
        const input = inputOf(l, mode);
        const lv = lowestVisibleHeightAglM(computeHorizon(input), l.surface, input);
        // Within 0.5 m, or 2 % of the height for tall shadows (GDAL interpolates in double precision and
        // our horizon is stored as Float32: the rounding is ~1e-6 relative, far below these bounds).
        let close = 0;
        for (let i = 0; i < lv.length; i++)
          if (Math.abs(lv[i] - l.ground[i]) <= Math.max(0.5, 0.02 * l.ground[i])) close++;
        const share = close / lv.length;
        report.push(`${mode} ${l.c.name} lowest visible height within 0.5 m: ${(share * 100).toFixed(2)} %`);
        // Accurate: measured 52–89 % (GDAL's own error against R3 is p90 0.9–8 m on these DEMs).
        expect(share, l.c.name).toBeGreaterThanOrEqual(mode === "fast" ? 0.995 : 0.45);
      }
    });
  }
  it("accurate mode is nearer the exact ray march (R3) than gdal_viewshed is: GDAL's interpolation is the approximation", () => {
    for (const l of cases) {
      const input = inputOf(l, "accurate");
      const ours = lowestVisibleHeightAglM(computeHorizon(input), l.surface, input);
      const cells: number[] = [];
      for (let i = 0; i < ours.length; i += 3) cells.push(i);
      const exact = lowestVisibleHeightAglM(rayMarchHorizon(input, cells), l.surface, input);
      const errOurs: number[] = [];
      const errGdal: number[] = [];
      for (const i of cells) {
        errOurs.push(Math.abs(ours[i] - exact[i]));
        errGdal.push(Math.abs(l.ground[i] - exact[i]));
      }
      const p90Ours = quantile(errOurs, 0.9);
      const p90Gdal = quantile(errGdal, 0.9);
      const p99Ours = quantile(errOurs, 0.99);
      const p99Gdal = quantile(errGdal, 0.99);
      report.push(
        `${l.c.name} vs R3, lowest visible height |error| p90/p99: accurate ${p90Ours.toFixed(2)}/${p99Ours.toFixed(2)} m, gdal_viewshed ${p90Gdal.toFixed(2)}/${p99Gdal.toFixed(2)} m`,
      );
      expect(p90Ours).toBeLessThanOrEqual(0.5);
      // TM7's p99 bound is for terrain; flat_earth is a dense block of 10–70 m buildings on 5 m cells,
      // where a cell between a ray that grazes a roof edge and one that misses it takes their mean
      // (measured p99 3.1 m there): bounded at 4 m.
      expect(p99Ours).toBeLessThanOrEqual(l.c.name === "flat_earth" ? 4 : 2.5);
      expect(p90Ours).toBeLessThan(p90Gdal);
      expect(p99Ours).toBeLessThan(p99Gdal);
    }
  });
  it("prints the measured agreement", () => {
    console.log(report.join("\n"));
    expect(report.length).toBeGreaterThan(0);
  });
});
