import { describe, expect, it } from "vitest";
import { unoverlappedLabels } from "../../src/map/labelDeclutter";

const box = (left: number, top: number, w: number, h: number) => ({
  left,
  top,
  right: left + w,
  bottom: top + h,
});

describe("label declutter", () => {
  it("hides a label that overlaps a fixed one or a more important one, keeps the rest", () => {
    const post = box(100, 100, 80, 14);
    const labels = [
      box(0, 0, 40, 14), // clear
      box(150, 105, 40, 14), // on the post's name
      box(20, 5, 40, 14), // on the first label
      box(0, 40, 40, 14), // clear
      box(0, 55, 40, 14), // 1 px below the fourth: inside the margin
      box(0, 0, 0, 0), // not laid out: kept, it hides nothing
    ];
    expect(unoverlappedLabels(labels, [post])).toEqual([true, false, false, true, false, true]);
    // A hidden label does not push out a later one.
    expect(unoverlappedLabels([box(0, 0, 10, 10), box(5, 0, 10, 10), box(16, 0, 10, 10)], [], 0)).toEqual([
      true,
      false,
      true,
    ]);
  });
});
