/**
 * The site drawn as vectors: protected areas (solid outline), the approach ring (dashed outer edge),
 * building footprints and tree stands with their heights as tooltips (text only). Takes finished geometry.
 */
import buffer from "@turf/buffer";
import type { Feature, MultiPolygon, Polygon } from "geojson";
import { buildingName, roofHeightOf } from "../io/buildingHeight";
import type { BuildingFeature, ProtectedArea, TreeStand } from "../io/planSchema";
import { areaGeometryProblem } from "../io/polygonRules";
import L from "./leaflet";

/** A footprint (by its index in the plan) or a tree stand (by id), as the Site panel edits them. */
export type ObstructionChoice = { kind: "building"; index: number } | { kind: "tree"; id: string };

export interface SiteView {
  protectedAreas: ProtectedArea[];
  approachRingDepthM: number;
  buildings: BuildingFeature[];
  treeStands: TreeStand[];
  showBuildings: boolean;
  /** The building (index) or tree stand (id) chosen for editing: drawn with a heavy outline. */
  selectedBuilding?: number | null;
  selectedTreeId?: string | null;
}

/** A protected area that cannot be evaluated (its outline crosses itself): red, finely dashed. */
const BAD_AREA_STYLE: L.PathOptions = { color: "#b00020", weight: 2.5, dashArray: "3 4" };

/** Outline of the chosen obstruction (the accent of the tool bar). */
const SELECTED_OUTLINE = { color: "#e07b00", weight: 3 };

function textTooltip(text: string): HTMLElement {
  const el = document.createElement("span");
  el.textContent = text;
  return el;
}

const BUILDING_STYLE: L.PathOptions = {
  color: "#3b2f2f",
  weight: 1,
  fillColor: "#8c7b70",
  fillOpacity: 0.55,
};
const TREE_STYLE: L.PathOptions = {
  color: "#24452a",
  weight: 1,
  fillColor: "#4f7a52",
  fillOpacity: 0.45,
  dashArray: "2 3",
};

function buildingLabel(b: BuildingFeature, i: number): string {
  const { heightM, source } = roofHeightOf(b.properties);
  return `${buildingName(b, i)}: ${source === "default" ? "default height" : `${heightM} m`}`;
}

/**
 * Above this many footprints and tree stands they are drawn on one canvas instead of one SVG element
 * each: an OSM export of a town (ten thousand footprints) held the page for about a second on import
 * and 0.4 s on every zoom as SVG. Fewer stay SVG, crisp and inspectable in the page.
 */
export const CANVAS_OBSTRUCTIONS_ABOVE = 400;

export class SiteLayer extends L.FeatureGroup {
  private readonly areas = L.featureGroup();
  private readonly ring = L.featureGroup();
  private readonly obstructions = L.featureGroup();
  /** What the layers were last built from: a part unchanged by reference is not built again. */
  private last: SiteView | null = null;
  private buildingLayers: L.GeoJSON[] = [];
  private treeLayers = new Map<string, L.GeoJSON>();
  /** The renderer of many footprints; it makes its canvas only when a footprint is added to it. */
  private readonly canvas = L.canvas({ padding: 0.5 });

  /**
   * `onChoose`: a footprint or tree stand chosen from the keyboard (Enter or Space on its outline, which
   * is in the tab order with its label as its name). On the canvas of many footprints there are no
   * elements to focus; the mouse chooses there.
   */
  constructor(private readonly onChoose?: (ref: ObstructionChoice) => void) {
    super();
    this.addLayer(this.obstructions);
    this.addLayer(this.ring);
    this.addLayer(this.areas);
  }

  setSite(v: SiteView): void {
    const last = this.last;
    this.last = v;
    if (!last || last.protectedAreas !== v.protectedAreas || last.approachRingDepthM !== v.approachRingDepthM)
      this.drawAreas(v);
    if (
      !last ||
      last.buildings !== v.buildings ||
      last.treeStands !== v.treeStands ||
      last.showBuildings !== v.showBuildings
    )
      this.drawObstructions(v);
    else {
      // Only the choice changed: restyle the two footprints concerned (thousands may be drawn).
      this.restyle(last, false);
      this.restyle(v, true);
    }
  }

  private restyle(v: SiteView, chosen: boolean): void {
    const b = v.selectedBuilding;
    if (b !== null && b !== undefined)
      this.buildingLayers[b]?.setStyle(chosen ? { ...BUILDING_STYLE, ...SELECTED_OUTLINE } : BUILDING_STYLE);
    const t = v.selectedTreeId;
    if (t !== null && t !== undefined)
      this.treeLayers.get(t)?.setStyle(chosen ? { ...TREE_STYLE, ...SELECTED_OUTLINE } : TREE_STYLE);
  }

  private drawAreas(v: SiteView): void {
    this.areas.clearLayers();
    this.ring.clearLayers();
    for (const a of v.protectedAreas) {
      // An outline that crosses itself (kept, not evaluated): drawn as a warning, with no ring around it.
      const bad = areaGeometryProblem(a.geometry) !== null;
      const layer = L.geoJSON(a.geometry as Polygon, {
        style: bad
          ? { ...BAD_AREA_STYLE, fill: false, interactive: false }
          : { color: "#111", weight: 2.5, fill: false, interactive: false },
      });
      this.areas.addLayer(layer);
      if (v.approachRingDepthM > 0 && !bad) {
        const outer = buffer(
          { type: "Feature", properties: {}, geometry: a.geometry } as Feature<Polygon | MultiPolygon>,
          v.approachRingDepthM,
          { units: "meters", steps: 16 },
        );
        if (outer) {
          this.ring.addLayer(
            L.geoJSON(outer, {
              style: { color: "#111", weight: 1.5, dashArray: "8 6", fill: false, interactive: false },
            }),
          );
        }
      }
    }
  }

  /** Once drawn as SVG, the outline of `layer` is a named button that Enter or Space chooses. */
  private keyboardChoice(layer: L.GeoJSON, label: string, ref: ObstructionChoice): void {
    if (!this.onChoose) return;
    const choose = this.onChoose;
    layer.on("add", () => {
      layer.eachLayer((part) => {
        const el = (part as L.Path).getElement?.();
        if (!(el instanceof SVGElement)) return;
        el.setAttribute("tabindex", "0");
        el.setAttribute("role", "button");
        el.setAttribute("aria-label", `${label} (press Enter to change it)`);
        L.DomEvent.on(el as unknown as HTMLElement, "keydown", (e) => {
          const k = (e as KeyboardEvent).key;
          if (k !== "Enter" && k !== " ") return;
          L.DomEvent.stop(e);
          choose(ref);
        });
      });
    });
  }

  private drawObstructions(v: SiteView): void {
    this.obstructions.clearLayers();
    this.buildingLayers = [];
    this.treeLayers = new Map();
    if (!v.showBuildings) return;
    const many = v.buildings.length + v.treeStands.length > CANVAS_OBSTRUCTIONS_ABOVE;
    const renderer = many ? { renderer: this.canvas } : {};
    v.buildings.forEach((b, i) => {
      const layer = L.geoJSON(b.geometry as Polygon, {
        ...renderer,
        style: i === v.selectedBuilding ? { ...BUILDING_STYLE, ...SELECTED_OUTLINE } : BUILDING_STYLE,
      });
      // The tooltip's element is made when it first opens: ten thousand footprints, ten thousand spans.
      layer.bindTooltip(() => textTooltip(buildingLabel(b, i)), { sticky: true });
      this.keyboardChoice(layer, buildingLabel(b, i), { kind: "building", index: i });
      this.buildingLayers.push(layer);
      this.obstructions.addLayer(layer);
    });
    for (const t of v.treeStands) {
      const layer = L.geoJSON(t.geometry as Polygon, {
        ...renderer,
        style: t.id === v.selectedTreeId ? { ...TREE_STYLE, ...SELECTED_OUTLINE } : TREE_STYLE,
      });
      const label = `${t.name ?? t.id}: canopy ${t.canopyHeightM} m`;
      layer.bindTooltip(() => textTooltip(label), { sticky: true });
      this.keyboardChoice(layer, label, { kind: "tree", id: t.id });
      this.treeLayers.set(t.id, layer);
      this.obstructions.addLayer(layer);
    }
  }
}
