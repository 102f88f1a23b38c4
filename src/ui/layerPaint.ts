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
  toIndex: (v: number) => number;
  /** Legend: title with unit and the labelled stops. */
  title: string;
  stops: { label: string; index: number }[];
}

let pdTable: ColourTable | null = null;
let lowTable: ColourTable | null = null;

export function layerScale(kind: LayerKind, maxOverlap: number, maxHeightM: number): LayerScale {
  if (kind === "overlap") {
    const classes = Math.max(2, maxOverlap + 1);
    const table = buildClassTable("viridis", classes, COVERAGE_ALPHA);
    return {
      table,
      toIndex: (v) => (v > 0 ? Math.min(v, classes - 1) : -1),
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
    title: kind === "single" ? "Pd of the chosen radar (0–1)" : "Combined Pd (0–1)",
    stops: [0, 0.25, 0.5, 0.75, 1].map((t) => ({ label: t.toFixed(2), index: Math.round(t * 255) })),
  };
}
