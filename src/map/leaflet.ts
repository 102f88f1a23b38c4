/**
 * The one place that imports Leaflet and its drawing plugin. The plugin is set to opt-in: only a map
 * created with `pmIgnore: false` (ours) gets drawing handlers, not every layer.
 */
import "./leafletGlobal";
import "@geoman-io/leaflet-geoman-free";
import L from "leaflet";

(L as unknown as { PM: { setOptIn(on: boolean): void } }).PM.setOptIn(true);

export default L;
