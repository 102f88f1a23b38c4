/**
 * Map labels that would overlap: each label, most important first, takes the first of a few nearby
 * places where it overlaps nothing placed before it; a label with no such place is hidden, so that every
 * shown label reads. Screen rectangles in CSS pixels (getBoundingClientRect).
 */

export interface ScreenBox {
  left: number;
  top: number;
  right: number;
  bottom: number;
}

/** A label's shift from where its anchor puts it, px. */
export interface LabelShift {
  dx: number;
  dy: number;
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

function shifted(b: ScreenBox, s: LabelShift): ScreenBox {
  return { left: b.left + s.dx, right: b.right + s.dx, top: b.top + s.dy, bottom: b.bottom + s.dy };
}

/** Places tried for a label: where it is, then just above, below, left and right of that. */
function candidates(b: ScreenBox, margin: number): LabelShift[] {
  const h = b.bottom - b.top + margin;
  const w = b.right - b.left + margin;
  return [
    { dx: 0, dy: 0 },
    { dx: 0, dy: -h },
    { dx: 0, dy: h },
    { dx: -w, dy: 0 },
    { dx: w, dy: 0 },
  ];
}

/**
 * Where to show each of `boxes` (most important first): the first nearby place where it overlaps none
 * of `fixed` (labels that always stay, e.g. post names) and no label placed before it, or null to hide
 * it. Empty boxes (not laid out) stay where they are and hide nothing.
 */
export function placeLabels(
  boxes: readonly ScreenBox[],
  fixed: readonly ScreenBox[],
  margin = LABEL_MARGIN_PX,
): (LabelShift | null)[] {
  const placed: ScreenBox[] = [];
  const free = (b: ScreenBox) =>
    !fixed.some((f) => overlaps(b, f, margin)) && !placed.some((k) => overlaps(b, k, margin));
  return boxes.map((b) => {
    if (b.right <= b.left || b.bottom <= b.top) return { dx: 0, dy: 0 };
    for (const s of candidates(b, margin)) {
      const at = shifted(b, s);
      if (free(at)) {
        placed.push(at);
        return s;
      }
    }
    return null;
  });
}

/**
 * placeLabels on the page: measures `labels` (most important first) and the shown elements matching
 * `fixedSelector` inside `container`, then shifts each label (CSS transform) or hides it. Labels start
 * again from where their anchors put them, so a new zoom decides afresh.
 */
export function placeLabelElements(
  labels: readonly HTMLElement[],
  container: HTMLElement,
  fixedSelector: string,
): void {
  if (labels.length === 0) return;
  for (const el of labels) {
    el.style.visibility = "";
    el.style.transform = "";
  }
  const box = (el: Element): ScreenBox => el.getBoundingClientRect();
  const fixed = Array.from(container.querySelectorAll<HTMLElement>(fixedSelector))
    .filter((el) => el.style.visibility !== "hidden")
    .map(box);
  const places = placeLabels(labels.map(box), fixed);
  labels.forEach((el, k) => {
    const s = places[k];
    if (!s) el.style.visibility = "hidden";
    else if (s.dx !== 0 || s.dy !== 0) el.style.transform = `translate(${s.dx}px, ${s.dy}px)`;
  });
}
