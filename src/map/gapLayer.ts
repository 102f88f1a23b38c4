/**
 * Gaps drawn to read without colour: diagonal hatching over every gap cell (a RasterLayer in hatch
 * pattern) and a solid outline around each gap with its area as a text label.
 */
import type { GridFrame } from "../coverage/grid";
import { TABLE_SIZE } from "./colourTable";
import { formatAreaM2, type GapShapes } from "./gapOutlines";
import L from "./leaflet";
import type { Forward } from "./pixelToGrid";
import { RasterLayer } from "./rasterLayer";

/** Outlines labelled with their area (the largest ones). */
const LABELLED_GAPS = 12;

/**
 * Indexed by the gap raster itself (0: no gap, transparent; 1: gap, dark), so that a new gap raster is
 * drawn without a pass over its cells on the main thread.
 */
function hatchTable(): Uint8ClampedArray {
  const t = new Uint8ClampedArray(TABLE_SIZE * 4);
  t[4] = 20;
  t[5] = 10;
  t[6] = 10;
  t[7] = 230;
  return t;
}

export class GapLayer extends L.LayerGroup {
  private readonly hatch = new RasterLayer({ pane: "picket-gaps" });
  private readonly outlines = L.layerGroup();
  private readonly table = hatchTable();

  constructor() {
    super();
    this.addLayer(this.hatch);
    this.addLayer(this.outlines);
  }

  setGaps(
    frame: GridFrame | null,
    forward: Forward | null,
    gap: Uint8Array | null,
    shapes: GapShapes | null,
  ): void {
    this.outlines.clearLayers();
    if (!frame || !forward || !gap) {
      this.hatch.setPaint(null);
      return;
    }
    // The gap raster is the index raster (see hatchTable); set again unchanged, it is not repainted.
    this.hatch.setPaint({ frame, forward, indices: gap, table: this.table, pattern: "hatch" });
    if (!shapes) return;
    // All outlines as one multipolygon: one SVG path for the map to add, lay out and remove instead
    // of one per gap (hundreds on a large site).
    if (shapes.outlines.length > 0)
      this.outlines.addLayer(
        L.polygon(shapes.outlines, { color: "#140a0a", weight: 1.5, fill: false, interactive: false }),
      );
    for (const label of shapes.labels.slice(0, LABELLED_GAPS)) {
      const el = document.createElement("span");
      el.textContent = formatAreaM2(label.areaM2);
      this.outlines.addLayer(
        L.marker(label.at, {
          interactive: false,
          keyboard: false,
          icon: L.divIcon({ className: "gap-label", html: el, iconSize: [0, 0] }),
        }),
      );
    }
  }
}
