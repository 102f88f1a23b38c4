import { describe, expect, it } from "vitest";
import { postsMetElsewhere } from "../../src/ui/selection";
import type { CoverageSlice } from "../../src/workers/protocol";

/** A slice with only the per-radar figures this check reads. */
function sliceWith(perRadar: { radarId: string; coveredAreaM2: number; onlyThisRadarAreaM2: number }[]) {
  return { metrics: { perRadar } } as unknown as CoverageSlice;
}

describe("posts met elsewhere", () => {
  it("names the posts no cell relies on alone, covering nothing included, in the metrics' order", () => {
    const s = sliceWith([
      { radarId: "knoll", coveredAreaM2: 1_124_300, onlyThisRadarAreaM2: 1_051_400 },
      { radarId: "hall-a", coveredAreaM2: 15_200, onlyThisRadarAreaM2: 0 },
      { radarId: "gate", coveredAreaM2: 16_200, onlyThisRadarAreaM2: 100 },
      { radarId: "tower", coveredAreaM2: 0, onlyThisRadarAreaM2: 0 },
    ]);
    expect(postsMetElsewhere(s)).toEqual(["hall-a", "tower"]);
    expect(postsMetElsewhere(sliceWith([]))).toEqual([]);
  });
});
