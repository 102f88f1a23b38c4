/** Building and tree-stand import: formats, height rules, and hostile files. */
import { zipSync } from "fflate";
import proj4 from "proj4";
import { describe, expect, it } from "vitest";
import {
  DEFAULT_BUILDING_HEIGHT_M,
  DEFAULT_CANOPY_HEIGHT_M,
  DEFAULT_METRES_PER_LEVEL,
  FOOT_M,
} from "../../src/coverage/constants.ts";
import type { GridFrame } from "../../src/coverage/grid.ts";
import { burnObstructions, flatGround } from "../../src/coverage/surfaces.ts";
import { parseBuildings, parseLengthM, type ToGrid } from "../../src/io/buildings.ts";
import { ImportError } from "../../src/io/importErrors.ts";

const UTM33 = "+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs";
const toUtm = proj4("EPSG:4326", UTM33);
const toGrid: ToGrid = (lon, lat) => {
  const p = toUtm.forward([lon, lat]);
  return [p[0], p[1]];
};
// The site: 1 km × 1 km of 5 m cells around 15.0° E, 47.0° N (UTM 33N x = 500 000 m on the central meridian).
const [cx, cy] = toGrid(15, 47);
const frame: GridFrame = {
  width: 200,
  height: 200,
  originX: Math.round(cx) - 500,
  originY: Math.round(cy) + 500,
  cellSizeM: 5,
  crs: UTM33,
};

/** A square footprint of about `sizeM` metres centred `dxM`, `dyM` from the site centre, as lon/lat. */
function square(dxM: number, dyM: number, sizeM = 40): number[][] {
  const inv = proj4(UTM33, "EPSG:4326");
  const h = sizeM / 2;
  const corners = [
    [-h, -h],
    [h, -h],
    [h, h],
    [-h, h],
    [-h, -h],
  ];
  return corners.map(([x, y]) => inv.forward([cx + dxM + x, cy + dyM + y]));
}

function fc(features: unknown[]): string {
  return JSON.stringify({ type: "FeatureCollection", features });
}

function polygonFeature(properties: Record<string, unknown>, ring = square(0, 0), id?: string) {
  return { type: "Feature", id, properties, geometry: { type: "Polygon", coordinates: [ring] } };
}

function importError(f: () => unknown): ImportError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(ImportError);
    expect((e as Error).name).toBe("ImportError");
    return e as ImportError;
  }
  throw new Error("expected an ImportError");
}

describe("parseLengthM", () => {
  it("[BL1] OSM-style lengths: metres by default, units, feet and inches, decimal commas, several values", () => {
    const ok = (v: unknown) => {
      const p = parseLengthM(v);
      if (!p.ok) throw new Error(p.reason);
      return p.m;
    };
    expect(ok("12")).toBe(12);
    expect(ok(7.5)).toBe(7.5);
    expect(ok("12.5 m")).toBe(12.5);
    expect(ok("12m")).toBe(12);
    expect(ok("12,5")).toBe(12.5);
    expect(ok("40 ft")).toBeCloseTo(40 * FOOT_M, 9);
    // 12 ft 6 in = 12.5 ft = 3.81 m exactly (1 ft = 0.3048 m).
    expect(ok("12'6\"")).toBeCloseTo(3.81, 9);
    expect(ok("12;15")).toBe(15);
    for (const bad of ["tall", "", "-3", "5000", "12 furlongs", null, true, {}]) {
      const p = parseLengthM(bad);
      expect(p.ok).toBe(false);
    }
  });
});

describe("parseBuildings: GeoJSON", () => {
  it("[BL2] height from `height`, else levels × metres per level (roof levels included), else the default; source kept", () => {
    const text = fc([
      polygonFeature({ height: "21.5 m" }, square(-200, 0), "a"),
      polygonFeature({ "building:levels": "4", "roof:levels": 1 }, square(0, 0), "b"),
      polygonFeature({ building: "yes" }, square(200, 0), "c"),
    ]);
    const { buildings, warnings } = parseBuildings(text, "site.geojson", toGrid, { frame });
    expect(buildings.map((b) => [b.id, b.heightM, b.heightSource])).toEqual([
      ["a", 21.5, "height"],
      ["b", 5 * DEFAULT_METRES_PER_LEVEL, "levels"],
      ["c", DEFAULT_BUILDING_HEIGHT_M, "default"],
    ]);
    expect(warnings).toEqual([]);
    // Rings are in the site frame's metres: the first vertex is toGrid of the first position.
    const [x, y] = toGrid(square(-200, 0)[0][0], square(-200, 0)[0][1]);
    expect(buildings[0].rings[0][0]).toBeCloseTo(x, 6);
    expect(buildings[0].rings[0][1]).toBeCloseTo(y, 6);
  });

  it("[BL3] min_height is kept as the underside; one not below the top is dropped with a note", () => {
    const text = fc([
      polygonFeature({ height: 9, min_height: 6 }, square(0, 0), "bridge"),
      polygonFeature({ height: 9, min_height: 12 }, square(100, 0), "odd"),
      polygonFeature({ "building:levels": 3, "building:min_level": 1 }, square(-100, 0), "overhang"),
    ]);
    const { buildings, warnings } = parseBuildings(text, "b.geojson", toGrid);
    expect(buildings[0].minHeightM).toBe(6);
    expect(buildings[1].minHeightM).toBe(0);
    expect(buildings[2].minHeightM).toBe(DEFAULT_METRES_PER_LEVEL);
    expect(warnings.some((w) => w.includes("features[1]") && w.includes("min_height"))).toBe(true);
  });

  it("[BL4] a non-numeric height falls back and the note names the feature and the field", () => {
    const text = fc([
      polygonFeature({ height: "tall", "building:levels": 2 }),
      polygonFeature({ height: "-4" }, square(100, 0)),
    ]);
    const { buildings, warnings } = parseBuildings(text, "h.geojson", toGrid);
    expect(buildings[0]).toMatchObject({ heightM: 2 * DEFAULT_METRES_PER_LEVEL, heightSource: "levels" });
    expect(buildings[1]).toMatchObject({ heightM: DEFAULT_BUILDING_HEIGHT_M, heightSource: "default" });
    // The note says what is used instead; a feature without an id is named by its path once.
    expect(warnings[0]).toMatch(
      new RegExp(
        `^h\\.geojson: features\\[0\\]\\.properties\\.height: "tall" is not a length.*; ${2 * DEFAULT_METRES_PER_LEVEL} m from building:levels used\\.$`,
      ),
    );
    expect(warnings[1]).toMatch(
      new RegExp(
        `features\\[1\\]\\.properties\\.height: .*negative.*; the default ${DEFAULT_BUILDING_HEIGHT_M} m used\\.$`,
      ),
    );
  });

  it("[BL5] empty features are skipped with a note; a file whose features are all unusable is refused", () => {
    const text = fc([
      { type: "Feature", properties: { height: 5 }, geometry: null },
      { type: "Feature", properties: {}, geometry: { type: "Polygon", coordinates: [] } },
      { type: "Feature", properties: {}, geometry: { type: "Polygon", coordinates: [[[15, 47]]] } },
      polygonFeature({ height: 10 }),
    ]);
    const { buildings, warnings } = parseBuildings(text, "e.geojson", toGrid);
    expect(buildings).toHaveLength(1);
    expect(warnings.filter((w) => /features\[[012]\]/.test(w))).toHaveLength(3);
    // No features at all (a plan without buildings): empty lists, no error.
    expect(parseBuildings(fc([]), "none.geojson", toGrid)).toEqual({
      buildings: [],
      treeStands: [],
      warnings: [],
    });
    const allEmpty = importError(() =>
      parseBuildings(fc([{ type: "Feature", properties: {}, geometry: null }]), "n.json", toGrid),
    );
    expect(allEmpty.message).toMatch(
      /^n\.json: no usable building or tree polygon among 1 features \(1 empty or invalid/,
    );
    const pointsOnly = JSON.stringify({
      type: "Feature",
      properties: {},
      geometry: { type: "Point", coordinates: [15, 47] },
    });
    expect(importError(() => parseBuildings(pointsOnly, "p.json", toGrid)).message).toMatch(
      /1 points, lines or untagged polygons ignored/,
    );
  });

  it("[BL6] coordinates in (lat, lon) order are recognised and refused with a message that says so", () => {
    const swapped = square(0, 0).map(([lon, lat]) => [lat, lon]);
    const e = importError(() =>
      parseBuildings(fc([polygonFeature({ height: 10 }, swapped)]), "swapped.geojson", toGrid, { frame }),
    );
    expect(e.message).toMatch(/^swapped\.geojson: .*\(latitude, longitude\) order/);
    expect(e.field).toBe("features[0].geometry.coordinates");
    // Far east (lon > 90°): read in the wrong order the "latitude" is impossible, and the message says why.
    const east = [
      [31.2, 121.5],
      [31.2, 121.6],
      [31.3, 121.6],
      [31.2, 121.5],
    ];
    const e2 = importError(() => parseBuildings(fc([polygonFeature({}, east)]), "east.geojson", toGrid));
    expect(e2.message).toMatch(
      /latitude beyond ±90°: the coordinates appear to be in \(latitude, longitude\) order/,
    );
  });

  it("[BL7] footprints far from the site: all → refused with the distance; some → dropped with a note", () => {
    // 11 km north of the site centre: 11 000 − 500 (half the site) − 20 (half the footprint) = 10 480 m from the grid.
    const far = square(0, 11_000);
    const e = importError(() =>
      parseBuildings(fc([polygonFeature({}, far)]), "far.geojson", toGrid, { frame }),
    );
    expect(e.message).toMatch(
      /none of the 1 footprints lies near the site grid \(the nearest is 10\.5 km from it\)/,
    );
    const { buildings, warnings } = parseBuildings(
      fc([polygonFeature({}, far), polygonFeature({})]),
      "mixed.geojson",
      toGrid,
      { frame },
    );
    expect(buildings).toHaveLength(1);
    expect(warnings.join(" ")).toMatch(/1 of 2 footprints lie far outside the site grid and were dropped/);
  });

  it("[BL8] projected coordinates or a non-WGS 84 `crs` member are refused (GeoJSON is lon/lat)", () => {
    const projected = [
      [500000, 5200000],
      [500040, 5200000],
      [500040, 5200040],
      [500000, 5200000],
    ];
    const e = importError(() => parseBuildings(fc([polygonFeature({}, projected)]), "utm.geojson", toGrid));
    expect(e.message).toMatch(/is not longitude\/latitude in degrees/);
    const withCrs = JSON.stringify({
      type: "FeatureCollection",
      crs: { type: "name", properties: { name: "urn:ogc:def:crs:EPSG::32633" } },
      features: [polygonFeature({})],
    });
    expect(importError(() => parseBuildings(withCrs, "crs.geojson", toGrid)).field).toBe("crs");
  });

  it("[BL9] tree stands: canopy height from the file, else the default; they burn with the buildings", () => {
    const text = fc([
      polygonFeature({ natural: "wood", height: "18 m" }, square(-100, 0, 60), "w1"),
      polygonFeature({ landuse: "forest" }, square(100, 0, 60), "w2"),
      polygonFeature({ canopyHeightM: 11 }, square(0, 150, 60), "w3"),
      polygonFeature({ height: 30 }, square(0, 0, 20), "tower"),
    ]);
    const { buildings, treeStands } = parseBuildings(text, "t.geojson", toGrid, { frame });
    expect(treeStands.map((t) => [t.id, t.canopyHeightM, t.heightSource])).toEqual([
      ["w1", 18, "height"],
      ["w2", DEFAULT_CANOPY_HEIGHT_M, "default"],
      ["w3", 11, "height"],
    ]);
    const { obstructionTopAglM } = burnObstructions(flatGround(frame, 400), buildings, treeStands);
    const at = (dx: number, dy: number) => {
      const col = Math.floor((cx + dx - frame.originX) / frame.cellSizeM);
      const row = Math.floor((frame.originY - (cy + dy)) / frame.cellSizeM);
      return obstructionTopAglM[row * frame.width + col];
    };
    expect(at(0, 0)).toBe(30);
    expect(at(-100, 0)).toBe(18);
    expect(at(100, 0)).toBe(DEFAULT_CANOPY_HEIGHT_M);
    expect(at(0, -300)).toBe(0);
  });

  it("[BL2] tags nested under `tags` (OSM converters without flat properties) are read as properties", () => {
    const text = fc([
      polygonFeature({ type: "way", id: 7, tags: { building: "yes", "building:levels": "2" } }),
    ]);
    const { buildings } = parseBuildings(text, "nested.geojson", toGrid);
    expect(buildings[0]).toMatchObject({ heightM: 2 * DEFAULT_METRES_PER_LEVEL, heightSource: "levels" });
  });

  it("[BL10] a MultiPolygon with a courtyard keeps all parts and its hole", () => {
    const outer = square(0, 0, 100);
    const hole = square(0, 0, 40).reverse();
    const wing = square(200, 0, 30);
    const text = fc([
      {
        type: "Feature",
        properties: { height: 15 },
        geometry: { type: "MultiPolygon", coordinates: [[outer, hole], [wing]] },
      },
    ]);
    const { buildings } = parseBuildings(text, "m.geojson", toGrid, { frame });
    expect(buildings).toHaveLength(1);
    expect(buildings[0].rings).toHaveLength(3);
    const { obstructionTopAglM } = burnObstructions(flatGround(frame, 0), buildings, []);
    const at = (dx: number, dy: number) =>
      obstructionTopAglM[
        Math.floor((frame.originY - (cy + dy)) / frame.cellSizeM) * frame.width +
          Math.floor((cx + dx - frame.originX) / frame.cellSizeM)
      ];
    expect(at(0, 0)).toBe(0); // courtyard
    expect(at(35, 0)).toBe(15); // block
    expect(at(200, 0)).toBe(15); // wing
  });

  it("[BL5] a footprint whose outline crosses itself is skipped with a note naming it (a run would refuse it)", () => {
    const [a, b, c, d] = square(0, 0);
    const bowTie = [a, c, b, d, a];
    const text = fc([
      polygonFeature({ height: 10 }, bowTie, "way/7"),
      polygonFeature({ height: 12 }, square(100, 0)),
    ]);
    const { buildings, warnings } = parseBuildings(text, "bow.geojson", toGrid);
    expect(buildings.map((x) => x.heightM)).toEqual([12]);
    expect(warnings[0]).toMatch(
      /^bow\.geojson: features\[0\] \(way\/7\)\.geometry\.coordinates\[0\]: the ring crosses itself near lon [\d.]+, lat [\d.]+; skipped\.$/,
    );
    expect(warnings[1]).toBe("bow.geojson: 1 feature with empty or invalid geometry was skipped.");
    const only = importError(() => parseBuildings(fc([polygonFeature({}, bowTie)]), "b.geojson", toGrid));
    expect(only.message).toMatch(/^b\.geojson: no usable building or tree polygon among 1 features/);
  });

  it("[BL11] unreadable files are refused with the file named", () => {
    expect(importError(() => parseBuildings("hello", "x.txt", toGrid)).message).toMatch(
      /^x\.txt: not GeoJSON, KML, KMZ or an OSM export/,
    );
    expect(importError(() => parseBuildings("<kml><Placemark></kml>", "bad.kml", toGrid)).message).toMatch(
      /^bad\.kml: not well-formed XML/,
    );
    expect(importError(() => parseBuildings("<gpx></gpx>", "t.gpx", toGrid)).message).toMatch(
      /neither <kml> nor <osm>/,
    );
    expect(importError(() => parseBuildings('{"type":"Topology"}', "t.json", toGrid)).field).toBe("type");
    // Binary bytes are described, not quoted; a .kmz that is no zip says so.
    const noise = new Uint8Array(4096).map((_, i) => (i * 97 + 13) % 256);
    expect(importError(() => parseBuildings(noise, "r.geojson", toGrid)).message).toBe(
      "r.geojson: not GeoJSON, KML, KMZ or an OSM export (the file holds binary data)",
    );
    expect(
      importError(() => parseBuildings(new TextEncoder().encode("plain words"), "f.kmz", toGrid)).message,
    ).toBe("f.kmz: not a zip archive: a .kmz file is a zip archive holding a .kml file");
    const broken = new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]);
    expect(importError(() => parseBuildings(broken, "b.kmz", toGrid)).message).toMatch(
      /^b\.kmz: damaged KMZ/,
    );
  });
});

const kmlText = (ring: number[][]) => `<?xml version="1.0" encoding="UTF-8"?>
<kml xmlns="http://www.opengis.net/kml/2.2"><Document>
<Placemark><name>Store B</name>
<ExtendedData><Data name="height"><value>14 m</value></Data></ExtendedData>
<Polygon><outerBoundaryIs><LinearRing><coordinates>${ring.map((p) => `${p[0]},${p[1]},0`).join(" ")}</coordinates></LinearRing></outerBoundaryIs></Polygon>
</Placemark>
<Placemark><name>Gate</name><Point><coordinates>15,47,0</coordinates></Point></Placemark>
</Document></kml>`;

describe("parseBuildings: KML, KMZ, OSM", () => {
  it("[BL12] KML placemarks with a height in ExtendedData", () => {
    const { buildings } = parseBuildings(kmlText(square(0, 0)), "site.kml", toGrid, { frame });
    expect(buildings).toHaveLength(1);
    expect(buildings[0]).toMatchObject({ heightM: 14, heightSource: "height" });
  });

  it("[BL13] KMZ: the zipped KML reads the same", () => {
    const kmz = zipSync({ "doc.kml": new TextEncoder().encode(kmlText(square(0, 0))) });
    const { buildings } = parseBuildings(kmz, "site.kmz", toGrid, { frame });
    expect(buildings).toHaveLength(1);
    expect(buildings[0].heightM).toBe(14);
    const noKml = zipSync({ "readme.txt": new TextEncoder().encode("x") });
    expect(importError(() => parseBuildings(noKml, "e.kmz", toGrid)).message).toMatch(/holds no \.kml/);
  });

  const ring = square(0, 0);
  const wood = square(150, 150, 80);
  const nodeXml = (id: number, [lon, lat]: number[]) => `<node id="${id}" lat="${lat}" lon="${lon}"/>`;
  const osmXml = `<?xml version="1.0"?><osm version="0.6">
${ring
  .slice(0, 4)
  .map((p, i) => nodeXml(i + 1, p))
  .join("\n")}
${wood
  .slice(0, 4)
  .map((p, i) => nodeXml(i + 11, p))
  .join("\n")}
<way id="100"><nd ref="1"/><nd ref="2"/><nd ref="3"/><nd ref="4"/><nd ref="1"/>
<tag k="building" v="yes"/><tag k="height" v="40 ft"/></way>
<way id="101"><nd ref="11"/><nd ref="12"/><nd ref="13"/><nd ref="14"/><nd ref="11"/><tag k="landuse" v="forest"/></way>
<way id="102"><nd ref="1"/><nd ref="3"/><tag k="highway" v="service"/></way>
<way id="103"><nd ref="11"/><nd ref="12"/><nd ref="13"/><nd ref="11"/><tag k="landuse" v="grass"/></way>
</osm>`;

  it("[BL14] OSM XML: buildings and forests are taken, roads and other areas are not", () => {
    const { buildings, treeStands } = parseBuildings(osmXml, "export.osm", toGrid, { frame });
    expect(buildings.map((b) => [b.id, b.heightSource])).toEqual([["way/100", "height"]]);
    expect(buildings[0].heightM).toBeCloseTo(40 * FOOT_M, 9);
    expect(treeStands.map((t) => t.id)).toEqual(["way/101"]);
  });

  it("[BL14] OSM XML: a multipolygon relation (outer and inner ways) keeps its courtyard", () => {
    const outer = square(0, -250, 100);
    const inner = square(0, -250, 40);
    const xml = `<osm version="0.6">
${outer
  .slice(0, 4)
  .map((p, i) => nodeXml(i + 21, p))
  .join("\n")}
${inner
  .slice(0, 4)
  .map((p, i) => nodeXml(i + 31, p))
  .join("\n")}
<way id="200"><nd ref="21"/><nd ref="22"/><nd ref="23"/><nd ref="24"/><nd ref="21"/></way>
<way id="201"><nd ref="31"/><nd ref="32"/><nd ref="33"/><nd ref="34"/><nd ref="31"/></way>
<relation id="300"><member type="way" ref="200" role="outer"/><member type="way" ref="201" role="inner"/>
<tag k="type" v="multipolygon"/><tag k="building" v="yes"/><tag k="building:levels" v="5"/></relation>
</osm>`;
    const { buildings } = parseBuildings(xml, "courtyard.osm", toGrid, { frame });
    expect(buildings.map((b) => [b.id, b.heightM, b.rings.length])).toEqual([["relation/300", 15, 2]]);
    const { obstructionTopAglM } = burnObstructions(flatGround(frame, 0), buildings, []);
    const at = (dx: number, dy: number) =>
      obstructionTopAglM[
        Math.floor((frame.originY - (cy + dy)) / frame.cellSizeM) * frame.width +
          Math.floor((cx + dx - frame.originX) / frame.cellSizeM)
      ];
    expect(at(0, -250)).toBe(0);
    expect(at(35, -250)).toBe(15);
  });

  it("[BL15] Overpass JSON reads the same as OSM XML", () => {
    const elements = [
      ...ring.slice(0, 4).map((p, i) => ({ type: "node", id: i + 1, lon: p[0], lat: p[1] })),
      { type: "way", id: 100, nodes: [1, 2, 3, 4, 1], tags: { building: "yes", "building:levels": "3" } },
    ];
    const { buildings } = parseBuildings(JSON.stringify({ elements }), "overpass.json", toGrid, { frame });
    expect(buildings).toEqual([
      expect.objectContaining({ id: "way/100", heightSource: "levels", heightM: 9 }),
    ]);
  });
});
