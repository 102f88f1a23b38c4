/**
 * A latitude/longitude graticule for the offline basemap: lines every round step of degrees, chosen from
 * the view so that a handful of lines show, each labelled with its value. Redrawn on every move.
 */
import L from "./leaflet";

const STEPS_DEG = [10, 5, 2, 1, 0.5, 0.2, 0.1, 0.05, 0.02, 0.01, 0.005, 0.002, 0.001, 0.0005];
const TARGET_LINES = 6;

/** The graticule step for a view spanning `spanDeg` degrees: the largest step giving ≥ TARGET_LINES lines. */
export function graticuleStepDeg(spanDeg: number): number {
  for (const s of STEPS_DEG) if (spanDeg / s >= TARGET_LINES) return s;
  return STEPS_DEG[STEPS_DEG.length - 1];
}

function formatDeg(v: number, step: number, pos: string, neg: string): string {
  const decimals = Math.max(0, Math.ceil(-Math.log10(step)));
  return `${Math.abs(v).toFixed(decimals)}° ${v >= 0 ? pos : neg}`;
}

export class GraticuleLayer extends L.LayerGroup {
  private mapRef: L.Map | null = null;
  private readonly redrawBound = () => this.redraw();

  override onAdd(map: L.Map): this {
    super.onAdd(map);
    this.mapRef = map;
    map.on("moveend", this.redrawBound);
    this.redraw();
    return this;
  }

  override onRemove(map: L.Map): this {
    map.off("moveend", this.redrawBound);
    this.mapRef = null;
    return super.onRemove(map);
  }

  private redraw(): void {
    const map = this.mapRef;
    if (!map) return;
    this.clearLayers();
    const b = map.getBounds();
    const step = graticuleStepDeg(Math.min(b.getEast() - b.getWest(), b.getNorth() - b.getSouth()));
    const style: L.PolylineOptions = {
      color: "#4a4a4a",
      weight: 0.6,
      opacity: 0.5,
      interactive: false,
      dashArray: "2 4",
    };
    const west = Math.floor(b.getWest() / step) * step;
    const south = Math.floor(b.getSouth() / step) * step;
    for (let lon = west; lon <= b.getEast(); lon += step) {
      this.addLayer(
        L.polyline(
          [
            [b.getSouth(), lon],
            [b.getNorth(), lon],
          ],
          style,
        ),
      );
      this.addLayer(
        L.marker([b.getNorth(), lon], {
          interactive: false,
          keyboard: false,
          icon: L.divIcon({
            className: "graticule-label graticule-label-lon",
            html: "",
            iconSize: [0, 0],
          }),
        }).on("add", (e) => setLabel(e.target as L.Marker, formatDeg(lon, step, "E", "W"))),
      );
    }
    for (let lat = south; lat <= b.getNorth(); lat += step) {
      this.addLayer(
        L.polyline(
          [
            [lat, b.getWest()],
            [lat, b.getEast()],
          ],
          style,
        ),
      );
      this.addLayer(
        L.marker([lat, b.getWest()], {
          interactive: false,
          keyboard: false,
          icon: L.divIcon({ className: "graticule-label graticule-label-lat", html: "", iconSize: [0, 0] }),
        }).on("add", (e) => setLabel(e.target as L.Marker, formatDeg(lat, step, "N", "S"))),
      );
    }
  }
}

/**
 * Labels are set as text, never as HTML; in a span of their own, because the marker's box is 0 × 0
 * and only the span can carry the backing that keeps the label legible over gap hatching.
 */
function setLabel(marker: L.Marker, text: string): void {
  const el = marker.getElement();
  if (!el) return;
  const span = document.createElement("span");
  span.textContent = text;
  el.replaceChildren(span);
}
