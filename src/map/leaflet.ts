/**
 * The one place that imports Leaflet and its drawing plugin. geoman is a classic script that extends the
 * global `L`, so Leaflet is published on globalThis before the plugin is loaded.
 */
import L from "leaflet";

(globalThis as unknown as { L: typeof L }).L = L;

let geomanLoaded: Promise<void> | null = null;

/** Loads the drawing plugin once (after Leaflet is global). */
export function loadGeoman(): Promise<void> {
  if (!geomanLoaded) {
    geomanLoaded = import("@geoman-io/leaflet-geoman-free").then(() => undefined);
  }
  return geomanLoaded;
}

export default L;
