// @vitest-environment jsdom
import { describe, expect, it } from "vitest";
import L from "../../src/map/leaflet";
import { PostsLayer, type PostView } from "../../src/map/postsLayer";
import { mapOnPage } from "./mapOnPage";

function post(id: string, lonDeg: number, latDeg: number, name = id): PostView {
  return {
    id,
    name,
    lonDeg,
    latDeg,
    boresightAzDeg: 90,
    enabled: true,
    sectorWidthDeg: 120,
    sectorCentreAzDeg: 90,
    maxRangeM: 500,
    exposureDistanceM: 3,
  };
}

const noop = () => undefined;
const callbacks = { onSelect: noop, onDrag: noop, onDragEnd: noop, onBoresight: noop };
const display = { showSectors: true, showExposure: false };

/** The marker element of each post, by the name in its title. */
function markerElements(map: L.Map): Map<string, Element> {
  const out = new Map<string, Element>();
  for (const el of map.getContainer().querySelectorAll(".post-icon"))
    out.set((el.getAttribute("title") ?? "").replace(/: drag, or arrow keys, to move$/, ""), el);
  return out;
}

describe("posts layer", () => {
  it("keeps the markers whose look did not change when the posts change, and moves them", () => {
    const map = mapOnPage();
    const layer = new PostsLayer(callbacks);
    layer.addTo(map);
    layer.setPosts([post("a", 8.0, 47.0), post("b", 8.002, 47.001)], "a", display);
    const before = markerElements(map);
    expect([...before.keys()].sort()).toEqual(["a", "b"]);
    // Post b moved (a release after a drag): both markers stay the same elements, b at its new place.
    layer.setPosts([post("a", 8.0, 47.0), post("b", 8.003, 47.001)], "a", display);
    const moved = markerElements(map);
    expect(moved.get("a")).toBe(before.get("a"));
    expect(moved.get("b")).toBe(before.get("b"));
    const ll = map.layerPointToLatLng(L.DomUtil.getPosition(moved.get("b") as HTMLElement));
    expect(ll.lng).toBeCloseTo(8.003, 4); // to the pixel at zoom 15
    // A renamed post gets a new marker; a post taken away loses its marker; the others stay.
    layer.setPosts([post("a", 8.0, 47.0, "a2")], "a", display);
    const renamed = markerElements(map);
    expect([...renamed.keys()]).toEqual(["a2"]);
    expect(renamed.get("a2")).not.toBe(before.get("a"));
    // The selected post keeps one boresight handle, however often the layer is rebuilt, and the
    // handle follows the selection.
    expect(map.getContainer().querySelectorAll(".boresight-handle").length).toBe(1);
    const two = [post("a", 8.0, 47.0), post("b", 8.003, 47.001)];
    layer.setPosts(two, "a", display);
    layer.setPosts(two, "b", display);
    const handles = map.getContainer().querySelectorAll(".boresight-icon");
    expect(handles.length).toBe(1);
    const at = map.layerPointToLatLng(L.DomUtil.getPosition(handles[0] as HTMLElement));
    // Boresight 90°: the handle lies east of b, at b's latitude.
    expect(at.lat).toBeCloseTo(47.001, 3);
    expect(at.lng).toBeGreaterThan(8.003);
    map.remove();
  });

  it("keeps the sector outlines of posts that did not change, and makes the moved post's again", () => {
    const map = mapOnPage();
    const layer = new PostsLayer(callbacks);
    layer.addTo(map);
    const sectorPaths = () => [...map.getContainer().querySelectorAll('path[stroke="#1d3557"]')];
    layer.setPosts([post("a", 8.0, 47.0), post("b", 8.002, 47.001)], null, display);
    const before = sectorPaths();
    expect(before.length).toBe(2);
    // b moved, as on every pointer move of a drag: a's outline is the same element, b's a new one.
    layer.setPosts([post("a", 8.0, 47.0), post("b", 8.003, 47.001)], null, display);
    const after = sectorPaths();
    expect(after.length).toBe(2);
    expect(after.filter((e) => before.includes(e)).length).toBe(1);
    // Sectors hidden: none left; shown again: one per post.
    layer.setPosts([post("a", 8.0, 47.0), post("b", 8.003, 47.001)], null, {
      ...display,
      showSectors: false,
    });
    expect(sectorPaths().length).toBe(0);
    layer.setPosts([post("a", 8.0, 47.0), post("b", 8.003, 47.001)], null, display);
    expect(sectorPaths().length).toBe(2);
    map.remove();
  });

  it("chooses a post with Enter or Space and moves it with the arrow keys, keeping the focus", () => {
    const map = mapOnPage();
    const chosen: string[] = [];
    const moves: [string, number, number][] = [];
    const layer = new PostsLayer({
      ...callbacks,
      onSelect: (id) => chosen.push(id),
      onDragEnd: (id, lon, lat) => moves.push([id, lon, lat]),
    });
    layer.addTo(map);
    const posts = [post("a", 8.0, 47.0), post("b", 8.002, 47.001)];
    layer.setPosts(posts, null, display);
    const el = markerElements(map).get("b") as HTMLElement;
    const key = (target: HTMLElement, k: string, shiftKey = false) => {
      const e = new KeyboardEvent("keydown", { key: k, shiftKey, bubbles: true, cancelable: true });
      target.dispatchEvent(e);
      return e.defaultPrevented;
    };
    expect(key(el, "Enter")).toBe(true);
    expect(key(el, " ")).toBe(true);
    expect(chosen).toEqual(["b", "b"]);
    // Chosen, the marker is made again (its look changed) and keeps the focus.
    el.focus();
    layer.setPosts(posts, "b", display);
    const again = markerElements(map).get("b") as HTMLElement;
    expect(again).not.toBe(el);
    expect(document.activeElement).toBe(again);
    // North 1 m, then east 10 m with Shift: 1 m of latitude is 1/111 km of a degree (from memory,
    // about 111.2 km per degree), 10 m of longitude at 47° N is 10 / (111.2 km · cos 47°).
    expect(key(again, "ArrowUp")).toBe(true);
    expect(key(again, "ArrowRight", true)).toBe(true);
    expect(moves[0][0]).toBe("b");
    expect((moves[0][2] - 47.001) * 111_200).toBeCloseTo(1, 1);
    expect(moves[0][1]).toBeCloseTo(8.002, 9);
    expect((moves[1][1] - 8.002) * 111_200 * Math.cos((47.001 * Math.PI) / 180)).toBeCloseTo(10, 1);
    // Other keys are left to the page (Tab moves on, the map pans with its own keys elsewhere).
    expect(key(again, "Tab")).toBe(false);
    expect(moves).toHaveLength(2);
  });
});
