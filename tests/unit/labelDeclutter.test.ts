import { describe, expect, it } from "vitest";
import { placeLabels } from "../../src/map/labelDeclutter";

const box = (left: number, top: number, w: number, h: number) => ({
  left,
  top,
  right: left + w,
  bottom: top + h,
});

describe("label declutter", () => {
  it("keeps a clear label where it is, moves a clashing one beside itself, hides one with no free place", () => {
    const post = box(100, 100, 80, 14);
    const labels = [
      box(0, 0, 40, 14), // clear: stays
      box(150, 105, 40, 14), // on the post's name (100–114 px): one height up still touches it, down is free
      box(0, 30, 40, 14), // clear
    ];
    expect(placeLabels(labels, [post], 0)).toEqual([
      { dx: 0, dy: 0 },
      { dx: 0, dy: 14 },
      { dx: 0, dy: 0 },
    ]);
    // Boxed in on every side (above, below, left, right taken): hidden.
    const around = [
      box(50, 50, 40, 14),
      box(50, 34, 40, 14),
      box(50, 66, 40, 14),
      box(8, 50, 40, 14),
      box(92, 50, 40, 14),
    ];
    expect(placeLabels([box(50, 50, 40, 14)], around)).toEqual([null]);
    // Placed labels count like fixed ones; a hidden label takes no place.
    const places = placeLabels([box(0, 0, 10, 10), box(0, 0, 10, 10), box(0, 0, 10, 10)], [], 0);
    expect(places).toEqual([
      { dx: 0, dy: 0 },
      { dx: 0, dy: -10 },
      { dx: 0, dy: 10 },
    ]);
    // Not laid out: left as it is.
    expect(placeLabels([box(0, 0, 0, 0)], [post])).toEqual([{ dx: 0, dy: 0 }]);
  });
});
