/**
 * Publishes Leaflet on globalThis: the drawing plugin (geoman) is a classic script that extends the
 * global `L`. Imported before the plugin by leaflet.ts.
 */
import L from "leaflet";

(globalThis as unknown as { L: typeof L }).L = L;
