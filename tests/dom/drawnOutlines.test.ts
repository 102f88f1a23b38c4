// @vitest-environment jsdom
/** Shapes drawn on the map whose outline crosses itself: holes, buildings and tree stands are refused. */
import { beforeEach, describe, expect, it } from "vitest";
import type { AreaGeometry } from "../../src/io/planSchema";
import { refusedOutline } from "../../src/ui/mapHooks/useDrawTools";
import { useSession } from "../../src/ui/session";
import { squareGeometry } from "./squareGeometry";

/** A bow tie: the square's corners in the order that makes two edges cross. */
function bowTie(): AreaGeometry {
  const square = squareGeometry(15.3, 47.1, 0.0002);
  const [a, b, c, d] = (square.coordinates as number[][][])[0];
  return { type: "Polygon", coordinates: [[a, c, b, d, a]] };
}

describe("drawn outlines", () => {
  beforeEach(() => useSession.setState({ messages: [] }));

  it("lets a clean outline through and says nothing", () => {
    expect(refusedOutline("building", squareGeometry(15.3, 47.1, 0.0002))).toBe(false);
    expect(useSession.getState().messages).toEqual([]);
  });

  it("refuses a building, tree stand or hole that crosses itself, saying where", () => {
    for (const [tool, what] of [
      ["building", "building"],
      ["tree", "tree stand"],
      ["hole", "hole"],
    ] as const) {
      expect(refusedOutline(tool, bowTie())).toBe(true);
      expect(useSession.getState().messages.at(-1)?.text).toMatch(
        new RegExp(
          `^The ${what}'s outline is not valid \\(the ring crosses itself near lon [\\d.]+, lat [\\d.]+\\); nothing was added\\. Draw it again\\.$`,
        ),
      );
    }
  });
});
