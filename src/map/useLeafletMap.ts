/**
 * Our own React hook around one Leaflet map: creates it on a container element once, removes it on
 * unmount. Layers are added by other hooks that receive the map; React owns their life.
 */
import { type RefObject, useEffect, useRef, useState } from "react";
import L from "./leaflet";

/** Map panes of our raster layers and their stacking order. */
export const RASTER_PANES = { "picket-coverage": 350, "picket-gaps": 360 } as const;

export interface MapInit {
  centerLatLon: [number, number];
  zoom: number;
}

/** Returns the map once it exists (null before the first effect). */
export function useLeafletMap(container: RefObject<HTMLDivElement | null>, init: MapInit): L.Map | null {
  const [map, setMap] = useState<L.Map | null>(null);
  const initRef = useRef(init);
  useEffect(() => {
    const el = container.current;
    if (!el) return;
    const m = L.map(el, {
      center: initRef.current.centerLatLon,
      zoom: initRef.current.zoom,
      // Top right, added below: the top left holds the graticule's latitude labels.
      zoomControl: false,
      attributionControl: true,
      keyboard: true,
      maxZoom: 21,
      minZoom: 3,
      preferCanvas: false,
      // Drawing handlers for this map (the plugin is opt-in).
      pmIgnore: false,
    });
    m.attributionControl.setPrefix(false);
    L.control.zoom({ position: "topright" }).addTo(m);
    // Rasters sit between the basemap tiles (200) and the vectors (400): outlines always stay on top.
    for (const [name, z] of Object.entries(RASTER_PANES)) {
      const pane = m.createPane(name);
      pane.style.zIndex = String(z);
      pane.style.pointerEvents = "none";
    }
    setMap(m);
    return () => {
      m.remove();
      setMap(null);
    };
  }, [container]);
  return map;
}

/** Adds `layer` to `map` while both exist; removes exactly that layer on change or unmount. */
export function useMapLayer(map: L.Map | null, layer: L.Layer | null): void {
  useEffect(() => {
    if (!map || !layer) return;
    layer.addTo(map);
    return () => {
      layer.remove();
    };
  }, [map, layer]);
}
