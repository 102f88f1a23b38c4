/**
 * Map labels that would overlap: the ones that come later in order of importance are hidden, so that
 * every shown label reads. Screen rectangles in CSS pixels (getBoundingClientRect).
 */

export interface ScreenBox {
  left: number;
  top: number;
  right: number;
  bottom: number;
}

/** Clear space kept around a label, px. */
const LABEL_MARGIN_PX = 2;

function overlaps(a: ScreenBox, b: ScreenBox, margin: number): boolean {
  return (
    a.left < b.right + margin &&
    b.left < a.right + margin &&
    a.top < b.bottom + margin &&
    b.top < a.bottom + margin
  );
}

/**
 * Which of `boxes` (most important first) to show: a box is kept unless it overlaps one of `fixed`
 * (labels that always stay, e.g. post names) or a box kept before it. Empty boxes (not laid out) are kept.
 */
export function unoverlappedLabels(
  boxes: readonly ScreenBox[],
  fixed: readonly ScreenBox[],
  margin = LABEL_MARGIN_PX,
): boolean[] {
  const kept: ScreenBox[] = [];
  return boxes.map((b) => {
    if (b.right <= b.left || b.bottom <= b.top) return true;
    const clash = fixed.some((f) => overlaps(b, f, margin)) || kept.some((k) => overlaps(b, k, margin));
    if (!clash) kept.push(b);
    return !clash;
  });
}
