/**
 * Accurate sweep internals: under a range limit the rays stop once no cell in range takes them, which must
 * not change any cell in range (rule TM5 in docs/model-spec.md: cells beyond maxRangeM are NaN, the others
 * are the sweep's horizon). The ranges reach past every grid edge along the axes, so the sweep casts the
 * same rays as without a limit and only the corners fall out of range.
 */

import { describe, expect, it } from "vitest";
import { computeHorizon, type MaskInput } from "../../src/coverage/terrainMask.ts";
import { syntheticDem } from "../fixtures/viewshed/syntheticDem.ts";

describe("[TM5] accurate sweep under a range limit", () => {
  it("[TM5] inside maxRangeM every cell equals the unlimited sweep's, bit for bit; beyond it NaN", () => {
    const side = 400;
    const cellM = 10;
    const dem = syntheticDem({ width: side, height: side, cellSizeM: cellM, seed: 11, ridgeM: 60 });
    const s = dem.surface;
    // Centre, near an edge and in a corner.
    const posts = [
      [200, 190],
      [30, 260],
      [4, 395],
    ];
    for (const [col, row] of posts) {
      const base: MaskInput = {
        surface: s,
        observerX: s.originX + (col + 0.5) * cellM,
        observerY: s.originY - (row + 0.5) * cellM,
        antennaHeightAslM: s.data[row * side + col] + 12,
        effectiveEarthFactor: 4 / 3,
        mode: "accurate",
      };
      const full = computeHorizon(base);
      const axisCells = Math.max(col, side - 1 - col, row, side - 1 - row);
      const cornerCells = Math.hypot(Math.max(col, side - 1 - col), Math.max(row, side - 1 - row));
      for (const share of [0, 0.1, 0.37, 0.5, 0.83]) {
        const rangeM = (axisCells + 0.5 + share * (cornerCells - axisCells)) * cellM;
        const lim = computeHorizon({ ...base, maxRangeM: rangeM });
        let inRange = 0;
        let differ = 0;
        let notNan = 0;
        for (let r = 0; r < side; r++) {
          for (let c = 0; c < side; c++) {
            const i = r * side + c;
            // The sweep's own range test, in cells.
            if ((c - col) ** 2 + (r - row) ** 2 <= (rangeM / cellM) ** 2) {
              inRange++;
              if (
                !Object.is(lim.horizonSlope[i], full.horizonSlope[i]) ||
                !Object.is(lim.obstacleDistanceM[i], full.obstacleDistanceM[i])
              )
                differ++;
            } else if (!Number.isNaN(lim.horizonSlope[i]) || !Number.isNaN(lim.obstacleDistanceM[i]))
              notNan++;
          }
        }
        expect(inRange, `post ${col},${row} range ${rangeM}`).toBeGreaterThan(0);
        expect(differ, `post ${col},${row} range ${rangeM}`).toBe(0);
        expect(notNan, `post ${col},${row} range ${rangeM}`).toBe(0);
      }
    }
  });
});
