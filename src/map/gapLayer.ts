/**
 * Gaps drawn to read without colour: diagonal hatching over every gap cell (a RasterLayer in hatch
 * pattern) and a solid outline around each gap with its area as a text label.
 */
import type { GridFrame } from "../coverage/grid";
import { TABLE_SIZE } from "./colourTable";
import { formatAreaM2, type GapOutlineSource, ringToLatLng } from "./gapOutlines";
import { placeLabelElements } from "./labelDeclutter";
import L from "./leaflet";
import type { Forward } from "./pixelToGrid";
import { RasterLayer } from "./rasterLayer";

/** Outlines labelled with their area (the largest ones). */
const LABELLED_GAPS = 12;

/**
 * Outline vertices turned into map coordinates and added per task: the map adds the outlines over a
 * few tasks instead of one that would hold the page (about 60 ms for the gaps of 5.6 M cells).
 */
export const OUTLINE_BATCH_VERTICES = 8000;

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

/** Post names and marks, and RF-exposure labels: a gap's area label gives way to them. */
const LABELS_KEPT_SELECTOR = ".post-mark, .post-label, .exposure-label span";

export class GapLayer extends L.LayerGroup {
  private readonly hatch = new RasterLayer({ pane: "picket-gaps" });
  private readonly outlines = L.layerGroup();
  private readonly table = hatchTable();
  /** The area labels of the last setGaps, largest gap first. */
  private labels: HTMLElement[] = [];
  private onMap: L.Map | null = null;
  private readonly declutter = () => this.placeAreaLabels();

  constructor() {
    super();
    this.addLayer(this.hatch);
    this.addLayer(this.outlines);
  }

  override onAdd(map: L.Map): this {
    super.onAdd(map);
    this.onMap = map;
    map.on("zoomend", this.declutter);
    return this;
  }

  override onRemove(map: L.Map): this {
    map.off("zoomend", this.declutter);
    this.onMap = null;
    return super.onRemove(map);
  }

  /**
   * Moves an area label that would overlap a post's name or a larger gap's label to a free place just
   * beside it, or hides it when there is none (they overlap or not whatever the pan; a zoom or new
   * labels decide again).
   */
  placeAreaLabels(): void {
    const container = this.onMap?.getContainer();
    if (container) placeLabelElements(this.labels, container, LABELS_KEPT_SELECTOR);
  }

  /** The batches of outlines still to add (cancelled by the next setGaps). */
  private pendingBatch: ReturnType<typeof setTimeout> | null = null;

  /** Resolves once every outline of the last setGaps is on the map (for tests). */
  whenOutlined(): Promise<void> {
    return this.outlined;
  }
  private outlined: Promise<void> = Promise.resolve();

  setGaps(
    frame: GridFrame | null,
    forward: Forward | null,
    gap: Uint8Array | null,
    source: GapOutlineSource | null,
  ): void {
    if (this.pendingBatch !== null) clearTimeout(this.pendingBatch);
    this.pendingBatch = null;
    this.outlines.clearLayers();
    this.labels = [];
    this.outlined = Promise.resolve();
    if (!frame || !forward || !gap) {
      this.hatch.setPaint(null);
      return;
    }
    // The gap raster is the index raster (see hatchTable); set again unchanged, it is not repainted.
    this.hatch.setPaint({ frame, forward, indices: gap, table: this.table, pattern: "hatch" });
    if (!source) return;
    const { shapes, toLonLat } = source;
    for (const label of shapes.labels.slice(0, LABELLED_GAPS)) {
      const el = document.createElement("span");
      el.textContent = formatAreaM2(label.areaM2);
      this.labels.push(el);
      const [lon, lat] = toLonLat(label.x, label.y);
      this.outlines.addLayer(
        L.marker([lat, lon], {
          interactive: false,
          keyboard: false,
          icon: L.divIcon({ className: "gap-label", html: el, iconSize: [0, 0] }),
        }),
      );
    }
    this.placeAreaLabels();
    // Outlines as multipolygons of about OUTLINE_BATCH_VERTICES vertices each: few SVG paths for the
    // map to add, lay out and remove, and no task longer than one batch.
    let next = 0;
    this.outlined = new Promise<void>((resolve) => {
      const batch = () => {
        this.pendingBatch = null;
        const polygons: [number, number][][][] = [];
        let vertices = 0;
        while (next < shapes.outlines.length && vertices < OUTLINE_BATCH_VERTICES) {
          const rings = shapes.outlines[next++].rings;
          polygons.push(rings.map((r) => ringToLatLng(r, toLonLat)));
          for (const r of rings) vertices += r.length / 2;
        }
        if (polygons.length > 0)
          this.outlines.addLayer(
            L.polygon(polygons, { color: "#140a0a", weight: 1.5, fill: false, interactive: false }),
          );
        if (next < shapes.outlines.length) this.pendingBatch = setTimeout(batch, 0);
        else resolve();
      };
      batch();
    });
  }
}
