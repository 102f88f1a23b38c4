/**
 * A Leaflet GridLayer that draws a raster of the site grid: every tile pixel is mapped back to the grid
 * cell under it (pixelToGrid.ts), the cell's value is turned into a byte once per cell, and the byte picks
 * a colour from a 256-entry table. Nearest-cell sampling keeps cells crisp at any zoom. The layer computes
 * nothing about the site: it takes finished values and exposes setters.
 */

import type { GridFrame } from "../coverage/grid";
import { type ColourTable, TABLE_SIZE } from "./colourTable";
import L from "./leaflet";
import { type Forward, tileCellIndices } from "./pixelToGrid";

/** Finished raster to draw: per cell a table index 0…255, or -1 for transparent. */
export interface RasterPaint {
  frame: GridFrame;
  forward: Forward;
  /** Per cell, row-major: colour table index, or -1 (transparent); bytes index the table directly. */
  indices: Int16Array | Uint8Array;
  table: ColourTable;
  /** "fill" paints every pixel; "hatch" paints diagonal stripes only (reads without colour). */
  pattern: "fill" | "hatch";
}

/**
 * Time spent repainting tiles per animation frame, ms, shared by every raster layer (coverage, gap
 * hatching, hillshade): with a budget per layer, a release that repaints two layers ran both in one
 * frame, and on two cores busy with the workers that frame became one task of 75 ms wall time for
 * 20 ms of CPU (a Chrome trace, docs/performance.md).
 */
const REPAINT_BUDGET_MS = 8;

/** requestAnimationFrame where there is one (browsers), else a zero timeout (tests). */
function requestFrame(fn: () => void): number {
  if (typeof requestAnimationFrame === "function") return requestAnimationFrame(fn);
  return setTimeout(fn, 0) as unknown as number;
}

const HATCH_PERIOD_PX = 8;
const HATCH_WIDTH_PX = 2;
/** Tiles whose cell indices are kept per grid frame (256 kB each): the visible ones and some around. */
const INDEX_CACHE_TILES = 96;
/**
 * Tile side, px, Leaflet's usual 256. Tiles of 512 px (a quarter as many canvases per repaint) changed
 * nothing measurable in interleaved browser-bench runs on 1 M cells (4 December 2026): previews 20.6
 * against 20.1 a second, every slice 168 against 163.5 ms after a release (medians of 12).
 */
const TILE_PX = 256;
const FRAMES_KEPT = 2;

interface TileRecord {
  el: HTMLCanvasElement;
  coords: L.Coords;
  current: boolean;
}

export class RasterLayer extends L.GridLayer {
  private paint: RasterPaint | null = null;
  /**
   * Cell indices of tiles per grid frame, for the last FRAMES_KEPT frames: a drag preview on a coarser
   * grid and the full grid after it alternate, and neither should map its tiles again.
   */
  private indexCaches = new Map<string, Map<string, Int32Array>>();
  private indexCache = new Map<string, Int32Array>();

  constructor(options?: L.GridLayerOptions) {
    super({ tileSize: TILE_PX, updateWhenZooming: false, keepBuffer: 1, ...options });
  }

  /**
   * Replaces the raster and repaints the visible tiles in place (no flicker), a few per animation frame
   * within a time budget, so a large repaint never blocks the page for long.
   */
  setPaint(paint: RasterPaint | null): void {
    const before = this.paint;
    this.paint = paint;
    // The same raster again (a release's whole run after its shown slice): nothing to repaint.
    if (
      paint !== null &&
      before !== null &&
      paint.indices === before.indices &&
      paint.table === before.table &&
      paint.pattern === before.pattern &&
      paint.forward === before.forward &&
      frameKey(paint.frame) === frameKey(before.frame)
    )
      return;
    const key = paint ? frameKey(paint.frame) : "";
    let cache = this.indexCaches.get(key);
    if (cache) this.indexCaches.delete(key);
    else cache = new Map();
    // Most recently used last; the oldest frames go.
    this.indexCaches.set(key, cache);
    while (this.indexCaches.size > FRAMES_KEPT) {
      const oldest = this.indexCaches.keys().next().value;
      if (oldest === undefined) break;
      this.indexCaches.delete(oldest);
    }
    this.indexCache = cache;
    const tiles = (this as unknown as { _tiles?: Record<string, TileRecord> })._tiles;
    if (!tiles) return;
    this.pending = Object.values(tiles);
    requestRepaints(this);
  }

  private pending: TileRecord[] = [];

  /** Repaints the next pending tile; false once none is left. */
  repaintNext(): boolean {
    const rec = this.pending.shift();
    if (rec === undefined) return false;
    if (rec.el.isConnected) this.drawTile(rec.el, rec.coords);
    return this.pending.length > 0;
  }

  override createTile(coords: L.Coords): HTMLElement {
    const canvas = document.createElement("canvas");
    const size = this.getTileSize();
    canvas.width = size.x;
    canvas.height = size.y;
    this.drawTile(canvas, coords);
    return canvas;
  }

  private cellIndices(coords: L.Coords, paint: RasterPaint, sizePx: number): Int32Array {
    const key = `${coords.z}/${coords.x}/${coords.y}`;
    let idx = this.indexCache.get(key);
    if (!idx) {
      idx = tileCellIndices(paint.frame, paint.forward, coords, sizePx);
      if (this.indexCache.size >= INDEX_CACHE_TILES) {
        const first = this.indexCache.keys().next().value;
        if (first !== undefined) this.indexCache.delete(first);
      }
      this.indexCache.set(key, idx);
    }
    return idx;
  }

  private drawTile(canvas: HTMLCanvasElement, coords: L.Coords): void {
    const ctx = canvas.getContext("2d");
    if (!ctx) return;
    const n = canvas.width;
    ctx.clearRect(0, 0, n, n);
    const paint = this.paint;
    if (!paint) return;
    const cells = this.cellIndices(coords, paint, n);
    // One pixel buffer per layer, rewritten whole for each tile: a new ImageData per tile is 256 kB
    // to allocate, zero and collect again, dozens of times per repaint.
    if (this.image?.width !== n) this.image = ctx.createImageData(n, n);
    renderTilePixels(this.image.data, cells, paint, coords.x * n, coords.y * n, n);
    ctx.putImageData(this.image, 0, 0);
  }

  private image: ImageData | null = null;
}

/** Layers with tiles to repaint, served in turn within one budget per animation frame. */
const waiting = new Set<RasterLayer>();
let frameRequest: number | null = null;

function requestRepaints(layer: RasterLayer): void {
  waiting.add(layer);
  if (frameRequest === null) frameRequest = requestFrame(drainRepaints);
}

function drainRepaints(): void {
  frameRequest = null;
  const t0 = performance.now();
  // One tile of each layer in turn, so that every layer moves on in every frame.
  while (waiting.size > 0 && performance.now() - t0 < REPAINT_BUDGET_MS) {
    for (const layer of waiting) {
      if (!layer.repaintNext()) waiting.delete(layer);
      if (performance.now() - t0 >= REPAINT_BUDGET_MS) break;
    }
  }
  if (waiting.size > 0) frameRequest = requestFrame(drainRepaints);
}

/** The colour table as one 32-bit word per entry (the four RGBA bytes in memory order). */
const tableWords = new WeakMap<ColourTable, Uint32Array>();
function wordsOf(table: ColourTable): Uint32Array {
  let w = tableWords.get(table);
  if (!w) {
    const bytes = table.byteOffset % 4 === 0 ? table : table.slice();
    w = new Uint32Array(bytes.buffer, bytes.byteOffset, TABLE_SIZE);
    tableWords.set(table, w);
  }
  return w;
}

/**
 * Fills RGBA `out` for one tile from its cell indices, every pixel (transparent where no cell or no
 * colour is drawn), so one buffer serves tile after tile; exported for tests.
 */
export function renderTilePixels(
  out: Uint8ClampedArray,
  cells: Int32Array,
  paint: RasterPaint,
  originPx: number,
  originPy: number,
  sizePx: number,
): void {
  const { indices } = paint;
  const table = wordsOf(paint.table);
  const words = new Uint32Array(out.buffer, out.byteOffset, sizePx * sizePx);
  const hatch = paint.pattern === "hatch";
  const tableSize = TABLE_SIZE;
  for (let py = 0; py < sizePx; py++) {
    for (let px = 0; px < sizePx; px++) {
      const p = py * sizePx + px;
      const cell = cells[p];
      const k = cell < 0 ? -1 : indices[cell];
      if (
        k < 0 ||
        k >= tableSize ||
        (hatch && (originPx + px + originPy + py) % HATCH_PERIOD_PX >= HATCH_WIDTH_PX)
      )
        words[p] = 0;
      else words[p] = table[k];
    }
  }
}

function frameKey(f: GridFrame): string {
  return `${f.crs}|${f.originX}|${f.originY}|${f.cellSizeM}|${f.width}|${f.height}`;
}
