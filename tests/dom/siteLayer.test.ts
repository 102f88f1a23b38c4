// @vitest-environment jsdom
import { describe, expect, it } from "vitest";
import type { AreaGeometry, BuildingFeature } from "../../src/io/planSchema";
import { areaGeometryProblem } from "../../src/io/polygonRules";
import type L from "../../src/map/leaflet";
import { SiteLayer, type SiteView } from "../../src/map/siteLayer";
import { mapOnPage } from "./mapOnPage";
import { squareGeometry } from "./squareGeometry";

/** The footprints' polygons in drawing order (buildings, then tree stands). */
function footprints(layer: SiteLayer): L.Polygon[] {
  const group = (layer as unknown as { obstructions: L.FeatureGroup }).obstructions;
  const out: L.Polygon[] = [];
  group.eachLayer((g) => (g as L.GeoJSON).eachLayer((p) => out.push(p as L.Polygon)));
  return out;
}

describe("site layer", () => {
  const buildings: BuildingFeature[] = [0, 1, 2].map((k) => ({
    type: "Feature",
    geometry: squareGeometry(8 + k * 0.001, 47, 0.0002),
    properties: { height: 10 + k },
  }));
  const base: SiteView = {
    protectedAreas: [{ id: "a", name: "A", geometry: squareGeometry(7.99, 46.99, 0.02) }],
    approachRingDepthM: 300,
    buildings,
    treeStands: [{ id: "t1", geometry: squareGeometry(8.01, 47, 0.001), canopyHeightM: 15 }],
    showBuildings: true,
  };

  it("outlines the chosen building or tree stand, and a new choice restyles without drawing again", () => {
    const map = mapOnPage();
    const layer = new SiteLayer().addTo(map);
    layer.setSite({ ...base, selectedBuilding: 1 });
    const drawn = footprints(layer);
    expect(drawn).toHaveLength(4);
    expect(drawn.map((p) => p.options.weight)).toEqual([1, 3, 1, 1]);
    const ring = (layer as unknown as { ring: L.FeatureGroup }).ring.getLayers()[0];
    layer.setSite({ ...base, selectedBuilding: null, selectedTreeId: "t1" });
    // The same polygon objects, restyled; the approach ring (turf buffer) was not made again.
    expect(footprints(layer)).toEqual(drawn);
    expect(drawn.map((p) => p.options.weight)).toEqual([1, 1, 1, 3]);
    expect(drawn[3].options.color).toBe("#e07b00");
    expect((layer as unknown as { ring: L.FeatureGroup }).ring.getLayers()[0]).toBe(ring);
    // New buildings: drawn again, with the choice.
    layer.setSite({ ...base, buildings: buildings.slice(1), selectedBuilding: 0 });
    const again = footprints(layer);
    expect(again).toHaveLength(3);
    expect(again[0]).not.toBe(drawn[1]);
    expect(again.map((p) => p.options.weight)).toEqual([3, 1, 1]);
    map.remove();
  });

  it("puts each outline in the tab order, named by its label, and Enter or Space chooses it", () => {
    const map = mapOnPage();
    const chosen: unknown[] = [];
    const layer = new SiteLayer((ref) => chosen.push(ref)).addTo(map);
    layer.setSite(base);
    const outlines = footprints(layer).map((p) => p.getElement() as SVGElement | undefined);
    expect(outlines.map((el) => el?.getAttribute("aria-label"))).toEqual([
      "Building 1: 10 m (press Enter to change it)",
      "Building 2: 11 m (press Enter to change it)",
      "Building 3: 12 m (press Enter to change it)",
      "t1: canopy 15 m (press Enter to change it)",
    ]);
    expect(
      outlines.every((el) => el?.getAttribute("tabindex") === "0" && el.getAttribute("role") === "button"),
    ).toBe(true);
    outlines[1]?.dispatchEvent(new KeyboardEvent("keydown", { key: "Enter", bubbles: true }));
    outlines[3]?.dispatchEvent(new KeyboardEvent("keydown", { key: " ", bubbles: true }));
    outlines[0]?.dispatchEvent(new KeyboardEvent("keydown", { key: "a", bubbles: true }));
    expect(chosen).toEqual([
      { kind: "building", index: 1 },
      { kind: "tree", id: "t1" },
    ]);
    map.remove();
  });

  it("shows a footprint's tooltip, made when it opens, with the imported name as text, never as HTML", () => {
    const map = mapOnPage();
    const layer = new SiteLayer().addTo(map);
    const named: BuildingFeature = {
      ...buildings[0],
      properties: { height: 12, name: "<b>Annex</b><img src=x onerror=alert(1)>" },
    };
    layer.setSite({ ...base, buildings: [named] });
    const group = (layer as unknown as { buildingLayers: L.GeoJSON[] }).buildingLayers[0];
    group.openTooltip([47.0001, 8.0001]);
    const tip = document.querySelector(".leaflet-tooltip");
    expect(tip?.textContent).toBe("<b>Annex</b><img src=x onerror=alert(1)>: 12 m");
    expect(tip?.querySelector("b, img")).toBeNull();
    map.remove();
  });

  it("draws an area whose outline crosses itself as a warning, with no approach ring around it", () => {
    const map = mapOnPage();
    const layer = new SiteLayer().addTo(map);
    const bowTie: AreaGeometry = {
      type: "Polygon",
      coordinates: [
        [
          [8, 47],
          [8.01, 47.01],
          [8.01, 47],
          [8, 47.01],
          [8, 47],
        ],
      ],
    };
    expect(areaGeometryProblem(bowTie)).toMatch(/crosses itself/);
    expect(areaGeometryProblem(base.protectedAreas[0].geometry)).toBeNull();
    layer.setSite({
      ...base,
      protectedAreas: [...base.protectedAreas, { id: "b", name: "B", geometry: bowTie }],
    });
    const outlines: L.Path[] = [];
    (layer as unknown as { areas: L.FeatureGroup }).areas.eachLayer((g) =>
      (g as L.GeoJSON).eachLayer((p) => outlines.push(p as L.Path)),
    );
    expect(outlines.map((p) => p.options.color)).toEqual(["#111", "#b00020"]);
    expect((layer as unknown as { ring: L.FeatureGroup }).ring.getLayers()).toHaveLength(1);
    map.remove();
  });
});
