/** Small synthetic sites shared by the coverage tests (flat ground, walls, a rough surface). */
import { readFileSync } from "node:fs";
import {
  buildRadarKernel,
  type PlacedRadar,
  type RadarKernel,
  type TargetSpec,
} from "../../src/coverage/coverage.ts";
import type { PreparedSite } from "../../src/coverage/evaluate.ts";
import type { GridFrame } from "../../src/coverage/grid.ts";
import type { RadarModel } from "../../src/coverage/radarModel.ts";
import { computeHorizon, type HorizonResult } from "../../src/coverage/terrainMask.ts";

export function demoRadar(id: "kalvori-x9" | "mossbee-58" | "zorvane-s24"): RadarModel {
  const file = {
    "kalvori-x9": "kalvori-x9-rotating-pulsed.json",
    "mossbee-58": "mossbee-58-patch-fmcw.json",
    "zorvane-s24": "zorvane-s24-staring-fmcw.json",
  }[id];
  return JSON.parse(readFileSync(new URL(`../../demo-sites/radars/${file}`, import.meta.url), "utf8"));
}

export const UTM33 = "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs";

export function frameOf(width: number, height: number, cellSizeM: number): GridFrame {
  return { width, height, originX: 500_000, originY: 4_500_000, cellSizeM, crs: UTM33 };
}

/** Centre of cell (col, row) in the frame, m. */
export function cellXY(f: GridFrame, col: number, row: number): [number, number] {
  return [f.originX + (col + 0.5) * f.cellSizeM, f.originY - (row + 0.5) * f.cellSizeM];
}

/** Deterministic rough ground: sums of sines, tens of metres of relief. */
export function roughGround(f: GridFrame): Float32Array {
  const g = new Float32Array(f.width * f.height);
  for (let r = 0; r < f.height; r++)
    for (let c = 0; c < f.width; c++) {
      const x = c * f.cellSizeM;
      const y = r * f.cellSizeM;
      g[r * f.width + c] =
        100 +
        25 * Math.sin(x / 310 + 0.3) * Math.cos(y / 270) +
        8 * Math.sin(x / 53 + y / 71) +
        3 * Math.cos(x / 17 - y / 23);
    }
  return g;
}

export function placed(
  model: RadarModel,
  at: [number, number],
  antennaHeightAslM: number,
  extra: Partial<PlacedRadar> = {},
): PlacedRadar {
  return {
    id: extra.id ?? model.id,
    name: extra.name ?? model.name,
    model,
    scan: extra.scan ?? model.scan,
    x: at[0],
    y: at[1],
    antennaHeightAslM,
    boresightAzDeg: extra.boresightAzDeg ?? 0,
    tiltDeg: extra.tiltDeg ?? 0,
    ownFootprintRadiusM: extra.ownFootprintRadiusM ?? 0,
  };
}

export const quad: TargetSpec & { name: string } = {
  id: "quad",
  name: "quad",
  rcsDbsm: -20,
  swerling: 1,
  heightsAglM: [10, 30, 60],
};
export const fixedWing: TargetSpec & { name: string } = {
  id: "fw",
  name: "fixed wing",
  rcsDbsm: -10,
  swerling: 1,
  heightsAglM: [30, 60],
};

/** A site on the given ground with obstruction tops (default none) and the whole grid protected. */
export function siteOf(
  f: GridFrame,
  ground: Float32Array,
  radars: PlacedRadar[],
  opts: {
    top?: Float32Array;
    k?: number;
    heights?: number[];
    targets?: (TargetSpec & { name: string })[];
  } = {},
): PreparedSite {
  const n = f.width * f.height;
  const top = opts.top ?? new Float32Array(n);
  const surface = new Float32Array(n);
  for (let i = 0; i < n; i++) surface[i] = ground[i] + top[i];
  const targets = opts.targets ?? [quad];
  return {
    name: "test",
    frame: f,
    ground,
    surface,
    obstructionTopAglM: top,
    regions: { protectedArea: new Uint8Array(n).fill(1), approachRing: new Uint8Array(n) },
    radars,
    targets,
    requirement: { requiredPd: 0.8, pfa: 1e-6, looks: 1, targetIds: targets.map((t) => t.id) },
    heightsAglM: opts.heights ?? [10, 30, 60],
    effectiveEarthFactor: opts.k ?? 4 / 3,
    maskMode: "accurate",
    groundSource: "flat",
    warnings: [],
  };
}

/**
 * Radar-stage inputs for one radar of a site: its kernel and its accurate-mode horizon at k = 4/3,
 * the horizon cut at the kernel's reach when `clipToReach` is set.
 */
export function stageOf(
  site: PreparedSite,
  radar: PlacedRadar,
  opts: { clipToReach?: boolean } = {},
): { kernel: RadarKernel; horizon: HorizonResult } {
  const kernel = buildRadarKernel({
    radar,
    targets: site.targets,
    requirement: site.requirement,
    effectiveEarthFactor: 4 / 3,
  });
  const horizon = computeHorizon({
    surface: { ...site.frame, data: site.surface },
    observerX: radar.x,
    observerY: radar.y,
    antennaHeightAslM: radar.antennaHeightAslM,
    effectiveEarthFactor: 4 / 3,
    ...(opts.clipToReach ? { maxRangeM: kernel.maxRangeM } : {}),
    mode: "accurate",
  });
  return { kernel, horizon };
}

/**
 * 2 km square of 5 m cells on rough ground: one rotating radar reaching every cell (k), two
 * short-range staring radars (nw, se, at the given cells) that do not; both demo classes.
 */
export function threeRadarSite(
  nw: [number, number] = [60, 60],
  se: [number, number] = [330, 300],
): PreparedSite {
  const f = frameOf(400, 400, 5);
  const m = demoRadar("mossbee-58");
  return siteOf(
    f,
    roughGround(f),
    [
      placed(demoRadar("kalvori-x9"), cellXY(f, 200, 200), 160, { id: "k" }),
      placed(m, cellXY(f, nw[0], nw[1]), 150, { id: "nw", boresightAzDeg: 135, tiltDeg: -3 }),
      placed(m, cellXY(f, se[0], se[1]), 150, { id: "se", boresightAzDeg: 315, tiltDeg: -3 }),
    ],
    { targets: [quad, fixedWing] },
  );
}
