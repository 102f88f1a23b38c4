/**
 * The site drawn as vectors: protected areas (solid outline), the approach ring (dashed outer edge),
 * building footprints and tree stands with their heights as tooltips (text only). Takes finished geometry.
 */
import buffer from "@turf/buffer";
import type { Feature, MultiPolygon, Polygon } from "geojson";
import { DEFAULT_METRES_PER_LEVEL } from "../coverage/constants";
import type { BuildingFeature, ProtectedArea, TreeStand } from "../io/planSchema";
import L from "./leaflet";

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

/** Outline of the chosen obstruction (the accent of the tool bar). */
const SELECTED_OUTLINE = { color: "#e07b00", weight: 3 };

function textTooltip(text: string): HTMLElement {
  const el = document.createElement("span");
  el.textContent = text;
  return el;
}

export class SiteLayer extends L.FeatureGroup {
  private readonly areas = L.featureGroup();
  private readonly ring = L.featureGroup();
  private readonly obstructions = L.featureGroup();

  constructor() {
    super();
    this.addLayer(this.obstructions);
    this.addLayer(this.ring);
    this.addLayer(this.areas);
  }

  setSite(v: SiteView): void {
    this.areas.clearLayers();
    this.ring.clearLayers();
    this.obstructions.clearLayers();
    for (const a of v.protectedAreas) {
      const layer = L.geoJSON(a.geometry as Polygon, {
        style: { color: "#111", weight: 2.5, fill: false, interactive: false },
      });
      this.areas.addLayer(layer);
      if (v.approachRingDepthM > 0) {
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
    if (!v.showBuildings) return;
    v.buildings.forEach((b, i) => {
      const h =
        b.properties.height ?? (b.properties["building:levels"] ?? Number.NaN) * DEFAULT_METRES_PER_LEVEL;
      const layer = L.geoJSON(b.geometry as Polygon, {
        style: {
          color: "#3b2f2f",
          weight: 1,
          fillColor: "#8c7b70",
          fillOpacity: 0.55,
          ...(i === v.selectedBuilding ? SELECTED_OUTLINE : {}),
        },
      });
      layer.bindTooltip(
        textTooltip(
          `${typeof b.properties.name === "string" ? b.properties.name : `Building ${i + 1}`}: ${Number.isFinite(h) ? `${h} m` : "default height"}`,
        ),
        {
          sticky: true,
        },
      );
      this.obstructions.addLayer(layer);
    });
    for (const t of v.treeStands) {
      const layer = L.geoJSON(t.geometry as Polygon, {
        style: {
          color: "#24452a",
          weight: 1,
          fillColor: "#4f7a52",
          fillOpacity: 0.45,
          dashArray: "2 3",
          ...(t.id === v.selectedTreeId ? SELECTED_OUTLINE : {}),
        },
      });
      layer.bindTooltip(textTooltip(`${t.name ?? t.id}: canopy ${t.canopyHeightM} m`), { sticky: true });
      this.obstructions.addLayer(layer);
    }
  }
}
