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
   * toIndex over a whole raster, in one loop of its own per kind (a call of toIndex per cell costs
   * several times as much: on 5.6 M cells the difference is tens of ms on the main thread).
   */
  indices: (values: ArrayLike<number>) => Int16Array;
  /** Legend: title with unit and the labelled stops. */
  title: string;
  stops: { label: string; index: number }[];
}

let pdTable: ColourTable | null = null;
let lowTable: ColourTable | null = null;
/** Class tables by class count (one object per count, so an unchanged layer is not repainted). */
const classTables = new Map<number, ColourTable>();

/**
 * tableIndex(v, [minValue, maxValue]) for the values `keep` accepts, -1 for the others, over a raster:
 * the same arithmetic as tableIndex, written out.
 */
function linearIndices(
  values: ArrayLike<number>,
  minValue: number,
  maxValue: number,
  keep: "finite" | { atLeast: number },
): Int16Array {
  const out = new Int16Array(values.length);
  const span = maxValue - minValue;
  const last = 255;
  // One loop per test, so that the loop carries no choice between them.
  if (keep === "finite") {
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (v - v !== 0)
        out[i] = -1; // NaN and ±Infinity
      else {
        const t = (v - minValue) / span;
        out[i] = t <= 0 ? 0 : t >= 1 ? last : Math.round(t * last);
      }
    }
    return out;
  }
  const from = keep.atLeast;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!(v >= from)) out[i] = -1;
    else {
      const t = (v - minValue) / span;
      out[i] = t <= 0 ? 0 : t >= 1 ? last : Math.round(t * last);
    }
  }
  return out;
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
      indices: (values) => {
        const out = new Int16Array(values.length);
        const top = classes - 1;
        for (let i = 0; i < values.length; i++) {
          const v = values[i];
          out[i] = v > 0 ? Math.min(v, top) : -1;
        }
        return out;
      },
      title: "Radars meeting the required Pd (count)",
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
      indices: (values) => linearIndices(values, scale.minValue, scale.maxValue, "finite"),
      title: "Lowest visible height (m above ground)",
      stops: [0, 0.25, 0.5, 0.75, 1].map((t) => ({
        label: `${Math.round(t * top)} m`,
        index: Math.round(t * 255),
      })),
    };
  }
  pdTable ??= buildColourTable("cividis", COVERAGE_ALPHA);
  const scale = { minValue: 0, maxValue: 1 };
  return {
    table: pdTable,
    toIndex: (v) => (v >= PD_SHOWN_FROM ? tableIndex(v, scale) : -1),
    indices: (values) => linearIndices(values, scale.minValue, scale.maxValue, { atLeast: PD_SHOWN_FROM }),
    title: kind === "single" ? "Pd of the chosen radar (0–1)" : "Combined Pd (0–1)",
    stops: [0, 0.25, 0.5, 0.75, 1].map((t) => ({ label: t.toFixed(2), index: Math.round(t * 255) })),
  };
}
