/**
 * Candidate posts: a draggable marker per post, a boresight handle (drag it to turn the radar), the
 * scan sector and maximum instrumented range as outlines, and the RF-exposure distance as a circle.
 * The layer reports drags through callbacks; the plan is changed by the caller.
 */
import { placeLabelElements } from "./labelDeclutter";
import L from "./leaflet";
import { arcLatLngs, azimuthAndDistance, destinationLatLng } from "./localGeo";

export interface PostView {
  id: string;
  name: string;
  lonDeg: number;
  latDeg: number;
  boresightAzDeg: number;
  enabled: boolean;
  /** Width of the covered azimuth sector, degrees (360 for a rotating radar). */
  sectorWidthDeg: number;
  /** Centre of the sector, degrees clockwise from true north. */
  sectorCentreAzDeg: number;
  /** Maximum instrumented range, m. */
  maxRangeM: number;
  /** RF-exposure compliance distance for the general public, m (NaN when unknown). */
  exposureDistanceM: number;
}

export interface PostsCallbacks {
  onSelect: (id: string) => void;
  onDrag: (id: string, lonDeg: number, latDeg: number) => void;
  onDragEnd: (id: string, lonDeg: number, latDeg: number) => void;
  onBoresight: (id: string, azDeg: number, done: boolean) => void;
}

export interface PostsDisplay {
  showSectors: boolean;
  showExposure: boolean;
}

/** A post moved by an arrow key goes this far, m (with Shift: the second figure). */
const KEY_STEP_M = 1;
const KEY_STEP_SHIFT_M = 10;
/** Azimuth of each arrow key's move, degrees from true north. */
const KEY_AZIMUTH_DEG: Record<string, number> = {
  ArrowUp: 0,
  ArrowRight: 90,
  ArrowDown: 180,
  ArrowLeft: 270,
};

/** Screen distance of the boresight handle from the post, px. */
const HANDLE_PX = 56;

/** Approximate width of a label character, px (11 px bold sans), for decluttering. */
const LABEL_CHAR_PX = 7;
const LABEL_HEIGHT_PX = 14;
const LABEL_OFFSET_PX = 12;

function postIcon(p: PostView, selected: boolean, withLabel: boolean): L.DivIcon {
  const el = document.createElement("div");
  el.className = `post-mark${selected ? " post-selected" : ""}${p.enabled ? "" : " post-disabled"}`;
  if (withLabel) {
    const label = document.createElement("span");
    label.className = "post-label";
    label.textContent = p.name;
    el.appendChild(label);
  }
  return L.divIcon({ className: "post-icon", html: el, iconSize: [18, 18], iconAnchor: [9, 9] });
}

function handleIcon(): L.DivIcon {
  const el = document.createElement("div");
  el.className = "boresight-handle";
  el.title = "Drag to turn the boresight";
  return L.divIcon({ className: "boresight-icon", html: el, iconSize: [14, 14], iconAnchor: [7, 7] });
}

export class PostsLayer extends L.LayerGroup {
  private readonly cb: PostsCallbacks;
  private posts: PostView[] = [];
  private selectedId: string | null = null;
  private display: PostsDisplay = { showSectors: true, showExposure: false };
  private readonly outlines = L.layerGroup();
  /**
   * Each post's sector outline with the shape it was made for: a rebuild (every pointer move of a drag,
   * every plan change) keeps those unchanged instead of making every outline again.
   */
  private readonly sectors = L.layerGroup();
  private readonly sectorOutlines = new Map<string, { outline: L.Polyline; shape: string }>();
  private readonly marks = L.layerGroup();
  /** The selected post's boresight line and handle, drawn again on every rebuild. */
  private readonly pointer = L.layerGroup();
  /**
   * Each post's marker with what its icon shows: a rebuild keeps a marker whose icon is unchanged
   * (only moving it), so a plan change (a post released after a drag) does not replace every marker.
   */
  private readonly markers = new Map<string, { marker: L.Marker; look: string }>();
  private mapRef: L.Map | null = null;
  private dragging = false;
  private readonly onZoom = () => this.rebuild();

  constructor(cb: PostsCallbacks) {
    super();
    this.cb = cb;
    this.addLayer(this.sectors);
    this.addLayer(this.outlines);
    this.addLayer(this.marks);
    this.addLayer(this.pointer);
  }

  override onAdd(map: L.Map): this {
    super.onAdd(map);
    this.mapRef = map;
    map.on("zoomend", this.onZoom);
    this.rebuild();
    return this;
  }

  override onRemove(map: L.Map): this {
    map.off("zoomend", this.onZoom);
    this.mapRef = null;
    return super.onRemove(map);
  }

  setPosts(posts: PostView[], selectedId: string | null, display: PostsDisplay): void {
    this.posts = posts;
    this.selectedId = selectedId;
    this.display = display;
    if (!this.dragging) this.rebuild();
    else this.rebuildOutlines();
  }

  private handleDistanceM(p: PostView): number {
    const map = this.mapRef;
    if (!map) return 100;
    const c = map.latLngToContainerPoint([p.latDeg, p.lonDeg]);
    const other = map.containerPointToLatLng([c.x, c.y - HANDLE_PX]);
    return azimuthAndDistance(p.lonDeg, p.latDeg, other.lng, other.lat).distanceM;
  }

  /** The RF-exposure labels of the last rebuild. */
  private exposureLabels: HTMLElement[] = [];

  /**
   * Moves an RF-exposure label that would overlap a post's mark or name (its own or a neighbour's) to
   * a free place beside itself; hidden only where none is free. Its disc stays where it is.
   */
  private placeExposureLabels(): void {
    const container = this.mapRef?.getContainer();
    if (container) placeLabelElements(this.exposureLabels, container, ".post-mark, .post-label");
  }

  /** The sector outlines of the shown posts: unchanged ones kept, changed ones made again. */
  private rebuildSectors(): void {
    const wanted = new Map<string, { p: PostView; shape: string }>();
    if (this.display.showSectors)
      for (const p of this.posts)
        if (p.enabled && p.maxRangeM > 0)
          wanted.set(p.id, {
            p,
            shape: [p.lonDeg, p.latDeg, p.sectorCentreAzDeg, p.sectorWidthDeg, p.maxRangeM].join("|"),
          });
    for (const [id, kept] of this.sectorOutlines)
      if (wanted.get(id)?.shape !== kept.shape) {
        this.sectors.removeLayer(kept.outline);
        this.sectorOutlines.delete(id);
      }
    for (const [id, { p, shape }] of wanted) {
      if (this.sectorOutlines.has(id)) continue;
      const arc = arcLatLngs(p.lonDeg, p.latDeg, p.sectorCentreAzDeg, p.sectorWidthDeg, p.maxRangeM);
      const pts: [number, number][] =
        p.sectorWidthDeg >= 360 ? arc : [[p.latDeg, p.lonDeg], ...arc, [p.latDeg, p.lonDeg]];
      const outline = L.polyline(pts, {
        color: "#1d3557",
        weight: 1.2,
        dashArray: "4 4",
        interactive: false,
        opacity: 0.9,
      });
      this.sectors.addLayer(outline);
      this.sectorOutlines.set(id, { outline, shape });
    }
  }

  private rebuildOutlines(): void {
    this.rebuildSectors();
    this.outlines.clearLayers();
    this.exposureLabels = [];
    for (const p of this.posts) {
      if (!p.enabled) continue;
      if (this.display.showExposure && p.exposureDistanceM > 0) {
        const label = document.createElement("span");
        label.textContent = `RF ${p.exposureDistanceM < 10 ? p.exposureDistanceM.toFixed(1) : Math.round(p.exposureDistanceM)} m`;
        this.exposureLabels.push(label);
        this.outlines.addLayer(
          L.marker([p.latDeg, p.lonDeg], {
            interactive: false,
            keyboard: false,
            icon: L.divIcon({ className: "exposure-label", html: label, iconSize: [0, 0] }),
          }),
        );
        this.outlines.addLayer(
          L.polygon(arcLatLngs(p.lonDeg, p.latDeg, 0, 360, p.exposureDistanceM, 6), {
            color: "#8b1e3f",
            weight: 1.5,
            fillColor: "#8b1e3f",
            fillOpacity: 0.15,
            interactive: false,
          }),
        );
      }
    }
  }

  /** Which posts get a name label: the selected one first, then any whose label would not overlap another. */
  private labelled(): Set<string> {
    const map = this.mapRef;
    const out = new Set<string>();
    if (!map) return out;
    const placed: [number, number, number, number][] = [];
    const order = [...this.posts].sort(
      (a, b) => Number(b.id === this.selectedId) - Number(a.id === this.selectedId),
    );
    for (const p of order) {
      const c = map.latLngToContainerPoint([p.latDeg, p.lonDeg]);
      const r: [number, number, number, number] = [
        c.x + LABEL_OFFSET_PX,
        c.y - LABEL_HEIGHT_PX / 2,
        c.x + LABEL_OFFSET_PX + p.name.length * LABEL_CHAR_PX,
        c.y + LABEL_HEIGHT_PX / 2,
      ];
      const clash = placed.some((q) => r[0] < q[2] && q[0] < r[2] && r[1] < q[3] && q[1] < r[3]);
      if (clash && p.id !== this.selectedId) continue;
      placed.push(r);
      out.add(p.id);
    }
    return out;
  }

  private rebuild(): void {
    this.rebuildOutlines();
    this.pointer.clearLayers();
    const labelled = this.labelled();
    const present = new Set(this.posts.map((p) => p.id));
    for (const [id, m] of this.markers) {
      if (present.has(id)) continue;
      this.marks.removeLayer(m.marker);
      this.markers.delete(id);
    }
    for (const p of this.posts) {
      const selected = p.id === this.selectedId;
      const look = JSON.stringify([p.name, p.enabled, selected, labelled.has(p.id)]);
      const kept = this.markers.get(p.id);
      if (kept?.look === look) {
        const ll = kept.marker.getLatLng();
        if (ll.lat !== p.latDeg || ll.lng !== p.lonDeg) kept.marker.setLatLng([p.latDeg, p.lonDeg]);
      } else {
        // A marker made again (chosen, renamed) keeps the keyboard focus it had.
        const focused = kept !== undefined && kept.marker.getElement() === document.activeElement;
        if (kept) this.marks.removeLayer(kept.marker);
        const marker = this.newMarker(p, selected, labelled.has(p.id));
        this.markers.set(p.id, { marker, look });
        if (focused) marker.getElement()?.focus();
      }
      if (!selected) continue;
      const d = this.handleDistanceM(p);
      const tip = destinationLatLng(p.lonDeg, p.latDeg, p.boresightAzDeg, d);
      const line = L.polyline([[p.latDeg, p.lonDeg], tip], {
        color: "#e07a00",
        weight: 3,
        interactive: false,
      });
      const handle = L.marker(tip, {
        icon: handleIcon(),
        draggable: true,
        keyboard: false,
        zIndexOffset: 2000,
      });
      const az = () => {
        const ll = handle.getLatLng();
        return azimuthAndDistance(p.lonDeg, p.latDeg, ll.lng, ll.lat).azDeg;
      };
      handle.on("dragstart", () => {
        this.dragging = true;
      });
      handle.on("drag", () => {
        line.setLatLngs([[p.latDeg, p.lonDeg], handle.getLatLng()]);
        this.cb.onBoresight(p.id, az(), false);
      });
      handle.on("dragend", () => {
        this.dragging = false;
        this.cb.onBoresight(p.id, az(), true);
      });
      this.pointer.addLayer(line);
      this.pointer.addLayer(handle);
    }
    this.placeExposureLabels();
  }

  private onMarkerKey(id: string, marker: L.Marker, e: KeyboardEvent): void {
    // Stopped here: the map's own keyboard handler would pan the map with the same keys.
    if (e.key === "Enter" || e.key === " ") {
      L.DomEvent.stop(e);
      this.cb.onSelect(id);
      return;
    }
    const az = KEY_AZIMUTH_DEG[e.key];
    if (az === undefined) return;
    L.DomEvent.stop(e);
    const ll = marker.getLatLng();
    const [lat, lon] = destinationLatLng(ll.lng, ll.lat, az, e.shiftKey ? KEY_STEP_SHIFT_M : KEY_STEP_M);
    this.cb.onSelect(id);
    this.cb.onDragEnd(id, lon, lat);
  }

  private newMarker(p: PostView, selected: boolean, withLabel: boolean): L.Marker {
    const marker = L.marker([p.latDeg, p.lonDeg], {
      icon: postIcon(p, selected, withLabel),
      draggable: true,
      keyboard: true,
      title: `${p.name}: drag, or arrow keys, to move`,
      alt: p.name,
      zIndexOffset: selected ? 1000 : 0,
    });
    marker.on("click", () => this.cb.onSelect(p.id));
    // From the keyboard: Enter or Space chooses the post; the arrow keys move it 1 m (10 m with
    // Shift), one plan change per key, as a drag's release.
    marker.on("add", () => {
      const el = marker.getElement();
      if (el) L.DomEvent.on(el, "keydown", (e) => this.onMarkerKey(p.id, marker, e as KeyboardEvent));
    });
    marker.on("dragstart", () => {
      this.dragging = true;
      this.cb.onSelect(p.id);
    });
    marker.on("drag", () => {
      const ll = marker.getLatLng();
      this.cb.onDrag(p.id, ll.lng, ll.lat);
    });
    marker.on("dragend", () => {
      this.dragging = false;
      const ll = marker.getLatLng();
      this.cb.onDragEnd(p.id, ll.lng, ll.lat);
    });
    this.marks.addLayer(marker);
    return marker;
  }
}
