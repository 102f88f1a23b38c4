/**
 * The colour scale of each map layer (no physics: value ranges and ramps for drawing and legends).
 */
import { buildClassTable, buildColourTable, type ColourTable, tableIndex } from "../map/colourTable";
import type { LayerKind } from "./session";

/** Opacity of the coverage layer over the basemap (0–255). */
const COVERAGE_ALPHA = 200;
/** Pd below this is drawn transparent so the basemap shows where nothing is detected. */
export const PD_SHOWN_FROM = 0.01;

export interface LayerScale {
  table: ColourTable;
  /** Table index of one value (-1: transparent). */
  toIndex: (v: number) => number;
  /**
   * toIndex over cells [from, to) of a raster into `out`, in one loop of its own per kind (a call of
   * toIndex per cell costs several times as much: on 5.6 M cells tens of ms on the main thread).
   */
  fill: (values: ArrayLike<number>, out: Int16Array, from: number, to: number) => void;
  /** Legend: title with unit and the labelled stops. */
  title: string;
  /** Legend: what a cell left without colour (the basemap showing through) means. */
  uncoloured: string;
  stops: { label: string; index: number }[];
}

let pdTable: ColourTable | null = null;
let lowTable: ColourTable | null = null;
/** Class tables by class count (one object per count, so an unchanged layer is not repainted). */
const classTables = new Map<number, ColourTable>();

/**
 * tableIndex(v, [minValue, maxValue]) for the values `keep` accepts, -1 for the others, over cells
 * [from, to): the same arithmetic as tableIndex, written out.
 */
function fillLinear(
  values: ArrayLike<number>,
  out: Int16Array,
  from: number,
  to: number,
  scale: { minValue: number; maxValue: number },
  keep: "finite" | { atLeast: number },
): void {
  const { minValue } = scale;
  const span = scale.maxValue - minValue;
  const last = 255;
  // (x + 0.5) | 0 is Math.round(x) for the x in (0, 255) it meets here, and about 4 times as fast
  // (Math.round is no single instruction in V8: 10 against 2.5 ns a cell, Node 20).
  // One loop per test, so that the loop carries no choice between them.
  if (keep === "finite") {
    for (let i = from; i < to; i++) {
      const v = values[i];
      if (v - v !== 0)
        out[i] = -1; // NaN and ±Infinity
      else {
        const t = (v - minValue) / span;
        out[i] = t <= 0 ? 0 : t >= 1 ? last : (t * last + 0.5) | 0;
      }
    }
    return;
  }
  const least = keep.atLeast;
  for (let i = from; i < to; i++) {
    const v = values[i];
    if (!(v >= least)) out[i] = -1;
    else {
      const t = (v - minValue) / span;
      out[i] = t <= 0 ? 0 : t >= 1 ? last : (t * last + 0.5) | 0;
    }
  }
}

/** The table indices of a whole raster (LayerScale.fill over every cell), into `out` when given. */
export function scaleIndices(
  scale: LayerScale,
  values: ArrayLike<number>,
  out = new Int16Array(values.length),
): Int16Array {
  scale.fill(values, out, 0, values.length);
  return out;
}

/**
 * scaleIndices in slices of about `budgetMs` each, a turn of the event loop between them, so that a
 * large raster never holds the main thread; null once `cancelled()` says so.
 */
export async function scaleIndicesInSlices(
  scale: LayerScale,
  values: ArrayLike<number>,
  cancelled: () => boolean,
  budgetMs = 8,
): Promise<Int16Array | null> {
  const out = new Int16Array(values.length);
  let cells = 65_536;
  for (let i = 0; i < values.length; ) {
    if (cancelled()) return null;
    const t0 = performance.now();
    const end = Math.min(values.length, i + cells);
    scale.fill(values, out, i, end);
    const ms = performance.now() - t0;
    // Aim the next slice at the budget from the pace of this one.
    cells = Math.max(4096, Math.round(((end - i) * budgetMs) / Math.max(ms, 0.05)));
    i = end;
    await new Promise((resolve) => setTimeout(resolve, 0));
  }
  return cancelled() ? null : out;
}

export function layerScale(kind: LayerKind, maxOverlap: number, maxHeightM: number): LayerScale {
  if (kind === "overlap") {
    const classes = Math.max(2, maxOverlap + 1);
    let table = classTables.get(classes);
    if (!table) {
      table = buildClassTable("viridis", classes, COVERAGE_ALPHA);
      classTables.set(classes, table);
    }
    const toIndex = (v: number) => (v > 0 ? Math.min(v, classes - 1) : -1);
    return {
      table,
      toIndex,
      fill: (values, out, from, to) => {
        const top = classes - 1;
        for (let i = from; i < to; i++) {
          const v = values[i];
          out[i] = v > 0 ? Math.min(v, top) : -1;
        }
      },
      title: "Radars meeting the required Pd (count)",
      uncoloured: "No colour: no radar meets the required Pd",
      stops: Array.from({ length: classes - 1 }, (_, k) => ({ label: String(k + 1), index: k + 1 })),
    };
  }
  if (kind === "lowest") {
    lowTable ??= buildColourTable("viridis", COVERAGE_ALPHA);
    const top = Math.max(1, maxHeightM);
    const scale = { minValue: 0, maxValue: top };
    return {
      table: lowTable,
      toIndex: (v) => (Number.isFinite(v) ? tableIndex(v, scale) : -1),
      fill: (values, out, from, to) => fillLinear(values, out, from, to, scale, "finite"),
      title: "Lowest visible height (m above ground)",
      uncoloured: "No colour: beyond every radar's range, or no terrain data",
      stops: [0, 0.25, 0.5, 0.75, 1].map((t) => ({
        // Heights above the top of the ramp take its last colour.
        label: `${t === 1 ? "≥ " : ""}${Math.round(t * top)} m`,
        index: Math.round(t * 255),
      })),
    };
  }
  pdTable ??= buildColourTable("cividis", COVERAGE_ALPHA);
  const scale = { minValue: 0, maxValue: 1 };
  return {
    table: pdTable,
    toIndex: (v) => (v >= PD_SHOWN_FROM ? tableIndex(v, scale) : -1),
    fill: (values, out, from, to) => fillLinear(values, out, from, to, scale, { atLeast: PD_SHOWN_FROM }),
    title: kind === "single" ? "Pd of the chosen radar (0–1)" : "Combined Pd (0–1)",
    uncoloured: `No colour: Pd below ${PD_SHOWN_FROM} (nothing detected)`,
    stops: [0, 0.25, 0.5, 0.75, 1].map((t) => ({ label: t.toFixed(2), index: Math.round(t * 255) })),
  };
}
