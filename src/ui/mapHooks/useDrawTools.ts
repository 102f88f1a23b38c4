/**
 * Drawing with geoman: protected areas, holes (cut from the area they fall in), buildings and tree
 * stands. While drawing, the length of the outline and the enclosed area are shown live (our own
 * readout: geometry on the metric grid of @turf/area). The drawn layer is turned into a plan change
 * and removed from the map (the site layer draws the plan).
 */
import area from "@turf/area";
import booleanPointInPolygon from "@turf/boolean-point-in-polygon";
import difference from "@turf/difference";
import type { Feature, MultiPolygon, Polygon } from "geojson";
import { useEffect, useState } from "react";
import type { AreaGeometry } from "../../io/planSchema";
import { areaGeometryProblem } from "../../io/polygonRules";
import type L from "../../map/leaflet";
import { azimuthAndDistance } from "../../map/localGeo";
import { addBuilding, addProtectedArea, addTreeStand, replaceAreaGeometry } from "../planEdits";
import { say, useSession } from "../session";
import { usePlanStore } from "../store";

export interface LiveMeasure {
  vertices: number;
  lengthM: number;
  areaM2: number;
}

type PmMap = L.Map & {
  pm: {
    enableDraw: (shape: string, opts?: object) => void;
    disableDraw: () => void;
    setGlobalOptions: (o: object) => void;
  };
};

function outlineLengthM(pts: L.LatLng[], closed: boolean): number {
  let s = 0;
  const n = pts.length;
  for (let i = 1; i < n + (closed ? 1 : 0); i++) {
    const a = pts[i - 1];
    const b = pts[i % n];
    s += azimuthAndDistance(a.lng, a.lat, b.lng, b.lat).distanceM;
  }
  return s;
}

function measure(pts: L.LatLng[]): LiveMeasure {
  const ring = pts.map((p) => [p.lng, p.lat]);
  let a = 0;
  if (ring.length >= 3) {
    a = area({ type: "Polygon", coordinates: [[...ring, ring[0]]] });
  }
  return { vertices: pts.length, lengthM: outlineLengthM(pts, pts.length >= 3), areaM2: a };
}

function cutHole(geometry: AreaGeometry): void {
  const plan = usePlanStore.getState().plan;
  if (!plan) return;
  const ring = (geometry as Polygon).coordinates[0];
  const inside = plan.protectedAreas.find((a) =>
    booleanPointInPolygon({ type: "Point", coordinates: ring[0] }, a.geometry as Polygon | MultiPolygon),
  );
  if (!inside) {
    say("warning", "A hole must be drawn inside a protected area; nothing was changed.");
    return;
  }
  const cut = difference({
    type: "FeatureCollection",
    features: [
      { type: "Feature", properties: {}, geometry: inside.geometry } as Feature<Polygon | MultiPolygon>,
      { type: "Feature", properties: {}, geometry } as Feature<Polygon>,
    ],
  });
  if (!cut) {
    say("warning", "That hole would remove the whole area; nothing was changed.");
    return;
  }
  usePlanStore
    .getState()
    .change((p) => replaceAreaGeometry(p, inside.id, cut.geometry as AreaGeometry), "cut hole");
}

/**
 * A hole, building or tree stand drawn with an outline that crosses itself has no inside: refused
 * with a message (true), nothing added. A protected area is kept instead and marked on the map and in
 * the Site panel (areaGeometryProblem), so that a large drawing is not lost to one wrong click.
 */
export function refusedOutline(tool: "hole" | "building" | "tree", geometry: AreaGeometry): boolean {
  const problem = areaGeometryProblem(geometry);
  if (problem === null) return false;
  const what = tool === "hole" ? "hole" : tool === "building" ? "building" : "tree stand";
  say("warning", `The ${what}'s outline is not valid (${problem}); nothing was added. Draw it again.`);
  return true;
}

export function useDrawTools(map: L.Map | null): LiveMeasure | null {
  const tool = useSession((s) => s.tool);
  const [live, setLive] = useState<LiveMeasure | null>(null);
  useEffect(() => {
    if (!map) return;
    if (tool !== "area" && tool !== "hole" && tool !== "building" && tool !== "tree") return;
    let working: L.Polyline | null = null;
    const onMove = (e: L.LeafletMouseEvent) => {
      if (!working) return;
      const pts = (working.getLatLngs() as L.LatLng[]).slice();
      setLive(measure([...pts, e.latlng]));
    };
    const onStart = (e: { workingLayer: L.Polyline }) => {
      working = e.workingLayer;
      setLive({ vertices: 0, lengthM: 0, areaM2: 0 });
    };
    const onCreate = (e: { layer: L.Polygon }) => {
      const gj = e.layer.toGeoJSON();
      e.layer.remove();
      setLive(null);
      const geometry = gj.geometry as AreaGeometry;
      const s = useSession.getState();
      const change = usePlanStore.getState().change;
      if (tool === "area") change((p) => addProtectedArea(p, geometry), "draw protected area");
      else if (refusedOutline(tool, geometry)) {
        // Nothing added: the tool stays on for the shape to be drawn again.
      } else if (tool === "hole") cutHole(geometry);
      else if (tool === "building")
        change((p) => addBuilding(p, geometry, s.newBuildingHeightM), "draw building");
      else change((p) => addTreeStand(p, geometry, s.newCanopyHeightM), "draw tree stand");
      // Stay in the tool for the next shape.
      (map as PmMap).pm.enableDraw("Polygon", { snappable: true, continueDrawing: false });
    };
    {
      const pm = (map as PmMap).pm;
      pm.setGlobalOptions({
        pathOptions: { color: tool === "area" || tool === "hole" ? "#111" : "#5a3d2b" },
      });
      // Listeners first: enableDraw fires pm:drawstart at once.
      map.on("pm:drawstart", onStart as unknown as L.LeafletEventHandlerFn);
      map.on("pm:create", onCreate as unknown as L.LeafletEventHandlerFn);
      map.on("mousemove", onMove);
      pm.enableDraw("Polygon", { snappable: true, continueDrawing: false });
    }
    return () => {
      map.off("pm:drawstart", onStart as unknown as L.LeafletEventHandlerFn);
      map.off("pm:create", onCreate as unknown as L.LeafletEventHandlerFn);
      map.off("mousemove", onMove);
      (map as PmMap).pm?.disableDraw();
      setLive(null);
    };
  }, [map, tool]);
  return live;
}
