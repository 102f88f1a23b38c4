/** A Leaflet map on an 800 × 600 jsdom element around (8° E, 47° N), animations off, for layer tests. */
import L from "../../src/map/leaflet";

export function mapOnPage(): L.Map {
  const el = document.createElement("div");
  Object.defineProperty(el, "clientWidth", { value: 800 });
  Object.defineProperty(el, "clientHeight", { value: 600 });
  document.body.appendChild(el);
  return L.map(el, { center: [47.0, 8.0], zoom: 15, zoomAnimation: false, fadeAnimation: false });
}
