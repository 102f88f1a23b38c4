/**
 * Properties of the masking sweeps (fast-check): monotone in antenna height, masked behind a ridge higher
 * than both ends of the sight line, and the derived quantities consistent with each other.
 * Rules TM3, TM4, TM6 in docs/model-spec.md.
 */

import fc from "fast-check";
import { describe, it } from "vitest";
import type { Grid } from "../../src/coverage/grid.ts";
import { rayMarchHorizon } from "../../src/coverage/rayMarch.ts";
import {
  computeHorizon,
  type HorizonResult,
  lowestVisibleHeightAglM,
  type MaskInput,
  obstructionClearanceM,
  visibleMask,
} from "../../src/coverage/terrainMask.ts";

const W = 28;
const H = 22;
const CELL_M = 10;

function gridOf(values: number[]): Grid {
  return {
    data: Float32Array.from(values),
    width: W,
    height: H,
    originX: 0,
    originY: 0,
    cellSizeM: CELL_M,
    crs: "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs",
  };
}

const terrain = fc.array(fc.float({ min: 0, max: 60, noNaN: true }), { minLength: W * H, maxLength: W * H });
const modes = fc.constantFrom("accurate", "fast", "exact");
const kFactor = fc.constantFrom(4 / 3, 1, Number.POSITIVE_INFINITY);

function horizon(input: MaskInput, mode: string): HorizonResult {
  return mode === "exact" ? rayMarchHorizon(input) : computeHorizon({ ...input, mode: mode as "fast" });
}

function input(g: Grid, col: number, row: number, antennaAslM: number, k: number): MaskInput {
  return {
    surface: g,
    observerX: (col + 0.5) * CELL_M,
    observerY: -(row + 0.5) * CELL_M,
    antennaHeightAslM: antennaAslM,
    effectiveEarthFactor: k,
    mode: "accurate",
  };
}

describe("terrain masking properties", () => {
  it("[TM4] a taller mast never sees less: the lowest visible height never rises with antenna height", () => {
    fc.assert(
      fc.property(
        terrain,
        fc.integer({ min: 0, max: W - 1 }),
        fc.integer({ min: 0, max: H - 1 }),
        fc.float({ min: 0, max: 80, noNaN: true }),
        fc.float({ min: Math.fround(0.5), max: 40, noNaN: true }),
        kFactor,
        modes,
        (z, col, row, lowM, extraM, k, mode) => {
          const g = gridOf(z);
          const a = input(g, col, row, lowM, k);
          const b = input(g, col, row, lowM + extraM, k);
          const la = lowestVisibleHeightAglM(horizon(a, mode), g, a);
          const lb = lowestVisibleHeightAglM(horizon(b, mode), g, b);
          for (let i = 0; i < la.length; i++) {
            // 1 mm: Float32 storage of the slopes.
            if (!(lb[i] <= la[i] + 1e-3)) return false;
          }
          return true;
        },
      ),
      { numRuns: 120 },
    );
  });

  it("[TM3] a cell behind a ridge higher than both the antenna and the cell is masked", () => {
    fc.assert(
      fc.property(
        terrain,
        fc.integer({ min: 0, max: 8 }),
        fc.integer({ min: 0, max: H - 1 }),
        fc.integer({ min: 10, max: 18 }),
        fc.float({ min: 1, max: 30, noNaN: true }),
        fc.float({ min: 1, max: 40, noNaN: true }),
        kFactor,
        modes,
        (z, col, row, ridgeCol, mastM, marginM, k, mode) => {
          const g = gridOf(z);
          const antenna = 60 + mastM; // above every terrain value
          const ridge = Math.fround(antenna + marginM);
          for (let r = 0; r < H; r++) g.data[r * W + ridgeCol] = ridge; // a wall across the whole grid
          const inp = input(g, col, row, antenna, k);
          const vis = visibleMask(horizon(inp, mode), g, inp, 0);
          const clear = obstructionClearanceM(horizon(inp, mode), g, inp, 0);
          for (let c = ridgeCol + 1; c < W; c++) {
            const i = row * W + c;
            if (vis[i] !== 0 || !(clear[i] > 0)) return false;
          }
          return true;
        },
      ),
      { numRuns: 120 },
    );
  });

  it("[TM6] visibility, lowest visible height and clearance agree for every cell and target height", () => {
    fc.assert(
      fc.property(
        terrain,
        fc.integer({ min: 0, max: W - 1 }),
        fc.integer({ min: 0, max: H - 1 }),
        fc.float({ min: 1, max: 80, noNaN: true }),
        fc.constantFrom(0, 10, 50),
        kFactor,
        modes,
        (z, col, row, antenna, targetM, k, mode) => {
          const g = gridOf(z);
          const inp = input(g, col, row, antenna, k);
          const h = horizon(inp, mode);
          const vis = visibleMask(h, g, inp, targetM);
          const lv = lowestVisibleHeightAglM(h, g, inp);
          const clear = obstructionClearanceM(h, g, inp, targetM);
          for (let i = 0; i < vis.length; i++) {
            if (vis[i] !== (lv[i] <= targetM + 1e-3 ? 1 : 0)) return false;
            // Hidden means the sight line passes below the dominant obstruction (positive clearance).
            if (vis[i] === 0 && !(clear[i] > -1e-3)) return false;
            if (vis[i] === 1 && clear[i] > 1e-3) return false;
          }
          return true;
        },
      ),
      { numRuns: 120 },
    );
  });
});
