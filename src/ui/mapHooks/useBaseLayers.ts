/**
 * The offline basemap: a hillshade of the site's ground (drawn from the DEM, or flat grey without one),
 * a graticule, and, only when the user set one, their tile server with its attribution.
 */
import { useEffect, useMemo, useRef } from "react";
import { GraticuleLayer } from "../../map/graticuleLayer";
import { greyTable, hillshadeIndicesInSlices } from "../../map/hillshade";
import L from "../../map/leaflet";
import { forwardTo } from "../../map/pixelToGrid";
import { RasterLayer } from "../../map/rasterLayer";
import { useMapLayer } from "../../map/useLeafletMap";
import type { CoverageView } from "../../workers/protocol";
import { type TileServer, useBasemap } from "../basemap";

export function useBaseLayers(map: L.Map | null, view: CoverageView | null): void {
  const hillshade = useMemo(() => new RasterLayer({ pane: "tilePane", zIndex: 1 }), []);
  const graticule = useMemo(() => new GraticuleLayer(), []);
  useMapLayer(map, hillshade);
  useMapLayer(map, graticule);
  const ground = view?.groundAmslM;
  // The frame object is new with every view; the hillshade only changes with the terrain.
  const terrainKey = view?.terrainKey;
  const frameRef = useRef(view?.frame);
  frameRef.current = view?.frame;
  const table = useMemo(() => greyTable(), []);
  // Shading a large grid takes long: it is done in slices (the map stays live) and kept per terrain.
  const shaded = useRef<{ key: string; indices: Int16Array } | null>(null);
  useEffect(() => {
    const frame = frameRef.current;
    if (!ground || !frame || !terrainKey) return;
    const paint = (indices: Int16Array) =>
      hillshade.setPaint({ frame, forward: forwardTo(frame.crs), indices, table, pattern: "fill" });
    if (shaded.current?.key === terrainKey) return paint(shaded.current.indices);
    let stop = false;
    void hillshadeIndicesInSlices({ ...frame, data: ground }, () => stop).then((indices) => {
      if (!indices) return;
      shaded.current = { key: terrainKey, indices };
      paint(indices);
    });
    return () => {
      stop = true;
    };
  }, [ground, terrainKey, hillshade, table]);
  const server = useBasemap((s) => s.server);
  const tiles = useMemo(() => (server ? tileLayerOf(server) : null), [server]);
  useMapLayer(map, tiles);
}

function tileLayerOf(s: TileServer): L.TileLayer {
  return L.tileLayer(s.urlTemplate, {
    attribution: escapeText(s.attribution),
    maxZoom: 21,
    zIndex: 2,
    opacity: 0.9,
  });
}

/** Leaflet puts attributions in as HTML: escape the user's text so it shows as text. */
export function escapeText(t: string): string {
  return t.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
