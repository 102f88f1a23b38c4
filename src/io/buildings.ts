/**
 * Building footprints and tree stands from GeoJSON, KML/KMZ or an OSM export (XML or Overpass JSON),
 * ready to burn onto the site grid (src/coverage/surfaces.ts).
 *
 * Heights above ground, in this order (each footprint keeps where its height came from):
 * 1. `height` (also `building:height`, `heightM`): "12", "12.5 m", "40 ft", "12'6\"", "12,5";
 *    several values ("12;15") take the largest;
 * 2. (`building:levels` + `roof:levels`) × metres per level;
 * 3. a default height.
 * `min_height` (else `building:min_level` × metres per level) is the underside of a bridge or
 * overhang; the 2.5-D surface takes the top and treats the span below as solid (see surfaces.ts).
 * Tree stands: `natural=wood`, `landuse=forest`, or any polygon with `canopyHeightM` /
 * `canopy_height`; canopy height from those keys or `height`, else a default.
 *
 * Coordinates are WGS 84 longitude, latitude (RFC 7946); `toGrid` turns them into the site frame's
 * x/y in metres. With the site frame given, footprints far outside the site are reported, and a
 * file written in (lat, lon) order is recognised and refused with a message that says so.
 */
import { kml } from "@tmcw/togeojson";
import { DOMParser } from "@xmldom/xmldom";
import { unzipSync } from "fflate";
import type { Feature, FeatureCollection, Geometry, Position } from "geojson";
import osmtogeojson, { type OsmJSON } from "osmtogeojson";
import {
  DEFAULT_BUILDING_HEIGHT_M,
  DEFAULT_CANOPY_HEIGHT_M,
  DEFAULT_METRES_PER_LEVEL,
  FOOT_M,
  MAX_ARCHIVE_ENTRY_BYTES,
  MAX_OBSTRUCTION_HEIGHT_M,
} from "../coverage/constants.ts";
import type { GridFrame } from "../coverage/grid.ts";
import type { BuildingShape, TreeStandShape } from "../coverage/surfaces.ts";
import { ImportError } from "./importErrors.ts";
import { polygonProblems } from "./polygonRules.ts";
import { MAX_NAME_CHARS } from "./schemaFields.ts";

/** Where a footprint's height came from. */
export type HeightSource = "height" | "levels" | "default";

/** A building footprint on the site grid, with its heights above ground and their source. */
export interface BuildingFootprint extends BuildingShape {
  /** The feature's id in the file (OSM "way/123", GeoJSON id) or its index ("features[3]"). */
  id: string;
  /** The feature's `name`, when it has one (shown as text, never as markup). */
  name?: string;
  heightSource: HeightSource;
}

/** A tree stand on the site grid. */
export interface TreeStand extends TreeStandShape {
  id: string;
  heightSource: "height" | "default";
}

/** WGS 84 longitude, latitude (degrees) → site frame x, y (m). */
export type ToGrid = (lonDeg: number, latDeg: number) => [number, number];

/** Options of the footprint import. */
export interface BuildingImportOptions {
  /** The site frame: enables the checks for footprints far outside the site and swapped coordinates. */
  frame?: GridFrame;
  /** Metres per level for `building:levels` (default DEFAULT_METRES_PER_LEVEL). */
  metresPerLevel?: number;
  /** Height of a building with no height or levels tag, m (default DEFAULT_BUILDING_HEIGHT_M). */
  defaultHeightM?: number;
  /** Canopy height of a tree stand with no height, m (default DEFAULT_CANOPY_HEIGHT_M). */
  defaultCanopyHeightM?: number;
}

/** The result of a footprint import. */
export interface BuildingImport {
  buildings: BuildingFootprint[];
  treeStands: TreeStand[];
  warnings: string[];
}

const DEG_LON_MAX = 180;
const DEG_LAT_MAX = 90;
// Per-feature notes listed one by one before they are summarised as a count.
const DETAILED_WARNINGS_MAX = 20;
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];
const INCHES_PER_FOOT = 12;
const M_PER_KM = 1000;

/** Outcome of parsing a length: metres, or why not. */
export type LengthParse = { ok: true; m: number } | { ok: false; reason: string };

/**
 * A length attribute in metres: a number (metres), or text "12", "12.5 m", "12,5", "40 ft",
 * "40 feet", "12'6\"" (feet and inches); several values separated by ";" give the largest.
 * Negative, non-numeric and values above MAX_OBSTRUCTION_HEIGHT_M are refused with a reason.
 */
export function parseLengthM(value: unknown): LengthParse {
  if (typeof value === "number") return checkLength(value, String(value));
  if (typeof value !== "string") return { ok: false, reason: `${JSON.stringify(value)} is not a length` };
  const parts = value.split(";").map((s) => s.trim());
  let best: number | undefined;
  for (const part of parts) {
    const m = parseOneLength(part);
    if (m === undefined)
      return { ok: false, reason: `"${value}" is not a length (expected e.g. "12", "12.5 m", "40 ft")` };
    if (best === undefined || m > best) best = m;
  }
  if (best === undefined) return { ok: false, reason: `"${value}" is empty` };
  return checkLength(best, value);
}

function parseOneLength(text: string): number | undefined {
  const t = text.trim().replace(/^(\d+),(\d+)/, "$1.$2");
  const feetInches = /^(\d+(?:\.\d+)?)\s*'\s*(\d+(?:\.\d+)?)\s*"$/.exec(t);
  if (feetInches) return (Number(feetInches[1]) + Number(feetInches[2]) / INCHES_PER_FOOT) * FOOT_M;
  const m = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+))\s*(m|metres?|meters?|ft|feet|foot|')?$/i.exec(t);
  if (!m) return undefined;
  const n = Number(m[1]);
  const unit = (m[2] ?? "m").toLowerCase();
  return unit === "ft" || unit === "feet" || unit === "foot" || unit === "'" ? n * FOOT_M : n;
}

function checkLength(m: number, shown: string): LengthParse {
  if (!Number.isFinite(m)) return { ok: false, reason: `"${shown}" is not a finite number` };
  if (m < 0) return { ok: false, reason: `${shown} is negative` };
  if (m > MAX_OBSTRUCTION_HEIGHT_M)
    return { ok: false, reason: `${shown} is above the ${MAX_OBSTRUCTION_HEIGHT_M} m limit` };
  return { ok: true, m };
}

/** A level count ("3", "2.5", "3;4" → largest); undefined with a reason when not a count. */
function parseLevels(value: unknown): LengthParse {
  const text = typeof value === "number" ? String(value) : typeof value === "string" ? value : "";
  let best: number | undefined;
  for (const part of text.split(";")) {
    const t = part.trim().replace(/^(\d+),(\d+)$/, "$1.$2");
    if (!/^\d+(?:\.\d+)?$/.test(t))
      return { ok: false, reason: `${JSON.stringify(value)} is not a number of levels` };
    const n = Number(t);
    if (best === undefined || n > best) best = n;
  }
  return best === undefined ? { ok: false, reason: "empty" } : { ok: true, m: best };
}

/** Notes per feature, listed up to a limit and then counted. */
class Notes {
  readonly lines: string[] = [];
  private extra = 0;
  constructor(private readonly file: string) {}
  add(text: string): void {
    if (this.lines.length < DETAILED_WARNINGS_MAX) this.lines.push(`${this.file}: ${text}`);
    else this.extra++;
  }
  finish(): string[] {
    if (this.extra > 0) this.lines.push(`${this.file}: … and ${this.extra} more notes like these.`);
    return this.lines;
  }
}

type Props = Record<string, unknown>;

function firstPresent(props: Props, keys: readonly string[]): [string, unknown] | undefined {
  for (const k of keys) {
    const v = props[k];
    if (v !== undefined && v !== null && v !== "") return [k, v];
  }
  return undefined;
}

function isTreeStand(props: Props): boolean {
  return (
    props.natural === "wood" ||
    props.landuse === "forest" ||
    props.canopyHeightM !== undefined ||
    props.canopy_height !== undefined
  );
}

function isOsmBuilding(props: Props): boolean {
  const b = props.building;
  const part = props["building:part"];
  return (b !== undefined && b !== "no") || (part !== undefined && part !== "no");
}

/** Decode bytes or pass text through; a zip (KMZ) is unpacked to its first .kml entry. */
function inputText(input: string | ArrayBuffer | Uint8Array, file: string): string {
  if (typeof input === "string") return input;
  const bytes = input instanceof Uint8Array ? input : new Uint8Array(input);
  if (ZIP_MAGIC.every((b, i) => bytes[i] === b)) {
    let tooBig: string | undefined;
    let entries: Record<string, Uint8Array>;
    try {
      entries = unzipSync(bytes, {
        filter: (f) => {
          if (!/\.kml$/i.test(f.name)) return false;
          if (f.originalSize > MAX_ARCHIVE_ENTRY_BYTES) {
            tooBig = f.name;
            return false;
          }
          return true;
        },
      });
    } catch (e) {
      throw new ImportError(file, `damaged KMZ/zip archive (${(e as Error).message})`);
    }
    if (tooBig !== undefined)
      throw new ImportError(file, `${tooBig} unpacks above ${MAX_ARCHIVE_ENTRY_BYTES} bytes`);
    const names = Object.keys(entries).sort((a, b) =>
      a === "doc.kml" ? -1 : b === "doc.kml" ? 1 : a.localeCompare(b),
    );
    if (names.length === 0) throw new ImportError(file, "the archive holds no .kml file");
    return new TextDecoder().decode(entries[names[0]]);
  }
  if (/\.kmz$/i.test(file)) {
    throw new ImportError(file, "not a zip archive: a .kmz file is a zip archive holding a .kml file");
  }
  return new TextDecoder().decode(bytes);
}

function parseXml(text: string, file: string) {
  try {
    // Errors and fatal errors stop the parse (no partial document); warnings are ignored.
    const parser = new DOMParser({
      onError: (level, message) => {
        if (level !== "warning") throw new Error(message);
      },
    });
    return parser.parseFromString(text, "text/xml");
  } catch (e) {
    const reason = (e as Error).message.split("\n")[0].replace(/^Reporting \w+ "|" caused .*$/g, "");
    throw new ImportError(file, `not well-formed XML (${reason})`);
  }
}

interface OsmElement {
  type: string;
  id: number;
  lat?: number;
  lon?: number;
  nodes?: number[];
  members?: { type: string; ref: number; role: string }[];
  tags?: Record<string, string>;
}

/** OSM XML → Overpass JSON elements (osmtogeojson's JSON path runs the same in Node and browsers). */
function osmXmlToElements(root: { childNodes: ArrayLike<unknown> }): OsmElement[] {
  type El = {
    nodeType: number;
    nodeName: string;
    getAttribute(n: string): string | null;
    childNodes: ArrayLike<unknown>;
  };
  const elements: OsmElement[] = [];
  const children = (n: { childNodes: ArrayLike<unknown> }) =>
    Array.from(n.childNodes as ArrayLike<El>).filter((c) => c.nodeType === 1);
  for (const el of children(root)) {
    const kind = el.nodeName;
    if (kind !== "node" && kind !== "way" && kind !== "relation") continue;
    const out: OsmElement = { type: kind, id: Number(el.getAttribute("id")) };
    const tags: Record<string, string> = {};
    let hasTags = false;
    for (const c of children(el)) {
      if (c.nodeName === "tag") {
        tags[c.getAttribute("k") ?? ""] = c.getAttribute("v") ?? "";
        hasTags = true;
      } else if (c.nodeName === "nd") {
        out.nodes ??= [];
        out.nodes.push(Number(c.getAttribute("ref")));
      } else if (c.nodeName === "member") {
        out.members ??= [];
        out.members.push({
          type: c.getAttribute("type") ?? "",
          ref: Number(c.getAttribute("ref")),
          role: c.getAttribute("role") ?? "",
        });
      }
    }
    if (kind === "node") {
      out.lat = Number(el.getAttribute("lat"));
      out.lon = Number(el.getAttribute("lon"));
    }
    if (hasTags) out.tags = tags;
    elements.push(out);
  }
  return elements;
}

/** The features of a file and whether they came from OSM (where only tagged buildings count). */
function featuresOf(text: string, file: string): { features: Feature[]; osm: boolean } {
  const start = text.trimStart();
  if (start.startsWith("<")) {
    const doc = parseXml(start, file);
    const root = doc.documentElement;
    if (!root) throw new ImportError(file, "empty XML document");
    if (root.nodeName === "osm") {
      const osmJson = { elements: osmXmlToElements(root) } as unknown as OsmJSON.OsmJSONObject;
      const fc = osmtogeojson(osmJson, { flatProperties: true }) as unknown as FeatureCollection;
      return { features: fc.features, osm: true };
    }
    if (root.nodeName === "kml" || root.nodeName.endsWith(":kml")) {
      return { features: kml(doc).features as Feature[], osm: false };
    }
    throw new ImportError(file, `XML root <${root.nodeName}> is neither <kml> nor <osm>`);
  }
  let json: unknown;
  try {
    json = JSON.parse(start);
  } catch (e) {
    throw new ImportError(file, `not GeoJSON, KML, KMZ or an OSM export (${jsonErrorText(e, start)})`);
  }
  if (typeof json !== "object" || json === null) throw new ImportError(file, "not a GeoJSON object", "type");
  const obj = json as Record<string, unknown>;
  if (Array.isArray(obj.elements)) {
    const fc = osmtogeojson(obj as unknown as OsmJSON.OsmJSONObject, {
      flatProperties: true,
    }) as unknown as FeatureCollection;
    return { features: fc.features, osm: true };
  }
  checkGeoJsonCrs(obj, file);
  if (obj.type === "FeatureCollection") {
    if (!Array.isArray(obj.features)) throw new ImportError(file, "must be an array", "features");
    return { features: obj.features as Feature[], osm: false };
  }
  if (obj.type === "Feature") return { features: [obj as unknown as Feature], osm: false };
  if (obj.type === "Polygon" || obj.type === "MultiPolygon") {
    return {
      features: [{ type: "Feature", properties: {}, geometry: obj as unknown as Geometry }],
      osm: false,
    };
  }
  throw new ImportError(
    file,
    `${JSON.stringify(obj.type)} is not a FeatureCollection, Feature or polygon`,
    "type",
  );
}

/** Control characters other than tab, line and page breaks, or U+FFFD (bytes that decode to no text). */
function looksBinary(head: string): boolean {
  for (let i = 0; i < head.length; i++) {
    const c = head.charCodeAt(i);
    if (c < 9 || (c > 13 && c < 32) || c === 0xfffd) return true;
  }
  return false;
}

/**
 * Why text is no JSON, without quoting it: the engine's message repeats the start of the text,
 * which for a binary file is garbage. Text that starts with printable characters is described as
 * text; anything else as binary data.
 */
function jsonErrorText(e: unknown, text: string): string {
  if (looksBinary(text.slice(0, 64))) return "the file holds binary data";
  const at = /position (\d+)/.exec(e instanceof Error ? e.message : "");
  return at ? `text that is not JSON, at character ${at[1]}` : "text that is not JSON";
}

/** A legacy GeoJSON `crs` member naming anything but WGS 84 lon/lat is refused. */
function checkGeoJsonCrs(obj: Record<string, unknown>, file: string): void {
  const crs = obj.crs as { properties?: { name?: unknown } } | undefined;
  const name = crs?.properties?.name;
  if (typeof name !== "string") return;
  if (/CRS84$|EPSG:+4326$/i.test(name)) return;
  throw new ImportError(
    file,
    `${name} is not WGS 84 longitude/latitude; GeoJSON footprints must be in lon/lat degrees (RFC 7946): reproject the file`,
    "crs",
  );
}

/** " (id)" after a feature's path in a note, or nothing when the feature has no id of its own. */
function idText(path: string, id: string): string {
  return id === path ? "" : ` (${id})`;
}

/** Polygons of a geometry (Polygon, MultiPolygon, or those inside a GeometryCollection). */
function polygonsOf(g: Geometry | null | undefined): Position[][][] {
  if (!g || typeof g !== "object") return [];
  if (g.type === "Polygon" && Array.isArray(g.coordinates)) return [g.coordinates];
  if (g.type === "MultiPolygon" && Array.isArray(g.coordinates)) return g.coordinates;
  if (g.type === "GeometryCollection" && Array.isArray(g.geometries)) return g.geometries.flatMap(polygonsOf);
  return [];
}

interface RawShape {
  path: string;
  id: string;
  props: Props;
  /** Rings in lon/lat, flat. */
  rings: Float64Array[];
}

/** Rings of a feature as flat lon/lat arrays; a ring with fewer than 3 distinct usable vertices is dropped. */
function lonLatRings(polygons: Position[][][]): { rings: Float64Array[]; badCoordinate?: Position } {
  const rings: Float64Array[] = [];
  for (const poly of polygons) {
    if (!Array.isArray(poly)) continue;
    for (const ring of poly) {
      if (!Array.isArray(ring)) continue;
      const flat = new Float64Array(ring.length * 2);
      let n = 0;
      for (const p of ring) {
        if (!Array.isArray(p) || !Number.isFinite(p[0]) || !Number.isFinite(p[1])) continue;
        if (Math.abs(p[0]) > DEG_LON_MAX || Math.abs(p[1]) > DEG_LAT_MAX)
          return { rings: [], badCoordinate: p };
        flat[n++] = p[0];
        flat[n++] = p[1];
      }
      if (n >= 6) rings.push(flat.slice(0, n));
    }
  }
  return { rings };
}

function mapRings(
  rings: readonly Float64Array[],
  f: (a: number, b: number) => [number, number],
): Float64Array[] {
  return rings.map((r) => {
    const out = new Float64Array(r.length);
    for (let i = 0; i < r.length; i += 2) {
      const [x, y] = f(r[i], r[i + 1]);
      out[i] = x;
      out[i + 1] = y;
    }
    return out;
  });
}

function bboxOf(rings: readonly Float64Array[]): [number, number, number, number] {
  let minX = Number.POSITIVE_INFINITY;
  let minY = Number.POSITIVE_INFINITY;
  let maxX = Number.NEGATIVE_INFINITY;
  let maxY = Number.NEGATIVE_INFINITY;
  for (const r of rings) {
    for (let i = 0; i < r.length; i += 2) {
      minX = Math.min(minX, r[i]);
      maxX = Math.max(maxX, r[i]);
      minY = Math.min(minY, r[i + 1]);
      maxY = Math.max(maxY, r[i + 1]);
    }
  }
  return [minX, minY, maxX, maxY];
}

/** Distance from a bbox to the frame's extent, m (0 when they touch or overlap; NaN when not finite). */
function distanceToFrameM(b: [number, number, number, number], frame: GridFrame): number {
  const fx0 = frame.originX;
  const fx1 = frame.originX + frame.width * frame.cellSizeM;
  const fy1 = frame.originY;
  const fy0 = frame.originY - frame.height * frame.cellSizeM;
  const dx = Math.max(0, fx0 - b[2], b[0] - fx1);
  const dy = Math.max(0, fy0 - b[3], b[1] - fy1);
  return Math.hypot(dx, dy);
}

/**
 * Parse building footprints (and tree stands) from GeoJSON, KML, KMZ or an OSM export.
 * `input`: the file as text or bytes (KMZ must be bytes); `fileName` names it in messages;
 * `toGrid` maps lon/lat degrees to the site frame's x/y in metres.
 * An empty collection gives empty lists. Throws ImportError naming the file (and field) when the
 * file cannot be read, has features but no usable polygon, is not in lon/lat, is in (lat, lon) order, or lies entirely far from the site; per-feature
 * problems (empty geometry, bad height) are warnings and that feature falls back or is skipped.
 */
export function parseBuildings(
  input: string | ArrayBuffer | Uint8Array,
  fileName: string,
  toGrid: ToGrid,
  options: BuildingImportOptions = {},
): BuildingImport {
  const file = fileName;
  const metresPerLevel = options.metresPerLevel ?? DEFAULT_METRES_PER_LEVEL;
  const defaultHeightM = options.defaultHeightM ?? DEFAULT_BUILDING_HEIGHT_M;
  const defaultCanopyM = options.defaultCanopyHeightM ?? DEFAULT_CANOPY_HEIGHT_M;
  const notes = new Notes(file);
  const { features, osm } = featuresOf(inputText(input, file), file);

  const raws: RawShape[] = [];
  let ignored = 0;
  let empty = 0;
  features.forEach((f, index) => {
    const path = `features[${index}]`;
    if (!f || typeof f !== "object") {
      notes.add(`${path}: not a feature; skipped.`);
      return;
    }
    const own: Props = f.properties && typeof f.properties === "object" ? (f.properties as Props) : {};
    // OSM converters without flat properties nest the tags under `tags`: read them as properties.
    const nested = own.tags && typeof own.tags === "object" ? (own.tags as Props) : {};
    const props: Props = { ...nested, ...own };
    const id = f.id !== undefined ? String(f.id) : typeof props.id === "string" ? props.id : path;
    const polygons = polygonsOf(f.geometry);
    if (polygons.length === 0) {
      if (
        !f.geometry ||
        (f.geometry.type !== "Point" &&
          f.geometry.type !== "LineString" &&
          f.geometry.type !== "MultiLineString" &&
          f.geometry.type !== "MultiPoint")
      ) {
        empty++;
        notes.add(`${path}${idText(path, id)}.geometry: empty or missing; skipped.`);
      } else ignored++;
      return;
    }
    if (osm && !isOsmBuilding(props) && !isTreeStand(props)) {
      ignored++;
      return;
    }
    const { rings, badCoordinate } = lonLatRings(polygons);
    if (badCoordinate) {
      const [first, second] = badCoordinate;
      // A second value beyond ±90 that would be a fine longitude, after a first that would be a fine latitude.
      const swapped = Math.abs(first) <= DEG_LAT_MAX && Math.abs(second) <= DEG_LON_MAX;
      throw new ImportError(
        file,
        swapped
          ? `(${first}, ${second}) has a latitude beyond ±90°: the coordinates appear to be in (latitude, ` +
              "longitude) order. GeoJSON positions are (longitude, latitude) (RFC 7946)"
          : `(${first}, ${second}) is not longitude/latitude in degrees; footprints must be ` +
              "WGS 84 lon/lat (RFC 7946): reproject the file",
        `${path}.geometry.coordinates`,
      );
    }
    if (rings.length === 0) {
      empty++;
      notes.add(`${path}${idText(path, id)}.geometry: no ring with 3 or more valid positions; skipped.`);
      return;
    }
    // A footprint whose outline crosses itself has no inside: the plan would refuse it at every run.
    const problem = polygons.flatMap((poly, k) =>
      polygonProblems(poly, f.geometry?.type === "MultiPolygon" ? ["coordinates", k] : ["coordinates"]),
    )[0];
    if (problem) {
      empty++;
      const at = problem.path.map((x) => (typeof x === "number" ? `[${x}]` : `.${x}`)).join("");
      notes.add(`${path}${idText(path, id)}.geometry${at}: ${problem.message}; skipped.`);
      return;
    }
    raws.push({ path, id, props, rings });
  });

  // A collection with no features at all is no error (a plan without buildings); the caller says
  // "nothing imported". Features that are all unusable mean a wrong or broken file.
  if (features.length === 0) return { buildings: [], treeStands: [], warnings: [] };
  if (raws.length === 0) {
    throw new ImportError(
      file,
      `no usable building or tree polygon among ${features.length} features` +
        (empty > 0 ? ` (${empty} empty or invalid geometries)` : "") +
        (ignored > 0 ? ` (${ignored} points, lines or untagged polygons ignored)` : ""),
    );
  }

  let grids = raws.map((r) => mapRings(r.rings, toGrid));
  if (options.frame) grids = checkPlacement(raws, grids, toGrid, options.frame, file, notes);

  const buildings: BuildingFootprint[] = [];
  const treeStands: TreeStand[] = [];
  raws.forEach((raw, k) => {
    const rings = grids[k];
    if (rings.length === 0) return;
    if (isTreeStand(raw.props)) {
      const found = firstPresent(raw.props, ["canopyHeightM", "canopy_height", "height"]);
      let canopyHeightM = defaultCanopyM;
      let heightSource: TreeStand["heightSource"] = "default";
      if (found) {
        const p = parseLengthM(found[1]);
        if (p.ok) {
          canopyHeightM = p.m;
          heightSource = "height";
        } else
          notes.add(
            `${raw.path}.properties.${found[0]}${idText(raw.path, raw.id)}: ${p.reason}; default canopy ${defaultCanopyM} m used.`,
          );
      }
      treeStands.push({ id: raw.id, rings, canopyHeightM, heightSource });
      return;
    }
    const name = typeof raw.props.name === "string" ? raw.props.name.trim().slice(0, MAX_NAME_CHARS) : "";
    buildings.push({
      id: raw.id,
      ...(name !== "" ? { name } : {}),
      rings,
      ...buildingHeights(raw, metresPerLevel, defaultHeightM, notes),
    });
  });
  if (empty > 0)
    notes.add(
      `${empty} feature${empty === 1 ? "" : "s"} with empty or invalid geometry ${empty === 1 ? "was" : "were"} skipped.`,
    );
  return { buildings, treeStands, warnings: notes.finish() };
}

function buildingHeights(
  raw: RawShape,
  metresPerLevel: number,
  defaultHeightM: number,
  notes: Notes,
): { heightM: number; minHeightM: number; heightSource: HeightSource } {
  let heightM = Number.NaN;
  let heightSource: HeightSource = "default";
  let badHeight: string | undefined;
  const found = firstPresent(raw.props, ["height", "building:height", "heightM"]);
  if (found) {
    const p = parseLengthM(found[1]);
    if (p.ok && p.m > 0) {
      heightM = p.m;
      heightSource = "height";
    } else
      badHeight = `${raw.path}.properties.${found[0]}${idText(raw.path, raw.id)}: ${p.ok ? "0 is no height" : p.reason}`;
  }
  if (heightSource === "default") {
    const levels = firstPresent(raw.props, ["building:levels"]);
    if (levels) {
      const p = parseLevels(levels[1]);
      const roof = firstPresent(raw.props, ["roof:levels"]);
      const r = roof ? parseLevels(roof[1]) : ({ ok: true, m: 0 } as LengthParse);
      if (!r.ok)
        notes.add(`${raw.path}.properties.roof:levels${idText(raw.path, raw.id)}: ${r.reason}; ignored.`);
      const total = p.ok ? p.m + (r.ok ? r.m : 0) : Number.NaN;
      if (p.ok && total > 0 && total * metresPerLevel <= MAX_OBSTRUCTION_HEIGHT_M) {
        heightM = total * metresPerLevel;
        heightSource = "levels";
      } else {
        notes.add(
          `${raw.path}.properties.building:levels${idText(raw.path, raw.id)}: ${p.ok ? `${total} levels is no usable height` : p.reason}; default used.`,
        );
      }
    }
  }
  if (heightSource === "default") heightM = defaultHeightM;
  if (badHeight !== undefined) {
    const used = heightSource === "levels" ? `${heightM} m from building:levels` : `the default ${heightM} m`;
    notes.add(`${badHeight}; ${used} used.`);
  }
  let minHeightM = 0;
  const minFound = firstPresent(raw.props, ["min_height"]);
  const minLevel = firstPresent(raw.props, ["building:min_level"]);
  if (minFound) {
    const p = parseLengthM(minFound[1]);
    if (p.ok) minHeightM = p.m;
    else notes.add(`${raw.path}.properties.min_height${idText(raw.path, raw.id)}: ${p.reason}; taken as 0.`);
  } else if (minLevel) {
    const p = parseLevels(minLevel[1]);
    if (p.ok) minHeightM = p.m * metresPerLevel;
    else
      notes.add(
        `${raw.path}.properties.building:min_level${idText(raw.path, raw.id)}: ${p.reason}; taken as 0.`,
      );
  }
  if (minHeightM >= heightM) {
    notes.add(
      `${raw.path}${idText(raw.path, raw.id)}: min_height ${minHeightM} m is not below the height ${heightM} m; taken as 0.`,
    );
    minHeightM = 0;
  }
  return { heightM, minHeightM, heightSource };
}

/**
 * Check where the footprints fall against the site frame: all far away but close when lon and
 * lat are swapped → refused as (lat, lon) order; all far away otherwise → refused; some far away
 * → dropped with a note. "Far" is beyond one site extent from the grid's edge.
 */
function checkPlacement(
  raws: readonly RawShape[],
  grids: Float64Array[][],
  toGrid: ToGrid,
  frame: GridFrame,
  file: string,
  notes: Notes,
): Float64Array[][] {
  const farM = Math.max(frame.width, frame.height) * frame.cellSizeM;
  const distances = grids.map((g) => distanceToFrameM(bboxOf(g), frame));
  const far = distances.filter((d) => !(d <= farM)).length;
  if (far === grids.length) {
    const swappedNear = raws.filter((r) => {
      const swapped = mapRings(r.rings, (lon, lat) =>
        Math.abs(lon) <= DEG_LAT_MAX ? toGrid(lat, lon) : [Number.NaN, Number.NaN],
      );
      return distanceToFrameM(bboxOf(swapped), frame) <= farM;
    }).length;
    if (swappedNear > 0) {
      throw new ImportError(
        file,
        `the coordinates appear to be in (latitude, longitude) order: with the two swapped, ${swappedNear} of ` +
          `${raws.length} footprints fall on the site. GeoJSON positions are (longitude, latitude) (RFC 7946)`,
        `${raws[0].path}.geometry.coordinates`,
      );
    }
    const nearestKm = Math.min(...distances.filter(Number.isFinite)) / M_PER_KM;
    throw new ImportError(
      file,
      `none of the ${raws.length} footprints lies near the site grid` +
        (Number.isFinite(nearestKm) ? ` (the nearest is ${nearestKm.toFixed(1)} km from it)` : "") +
        ": wrong file, or coordinates not in WGS 84 lon/lat?",
    );
  }
  if (far > 0)
    notes.add(`${far} of ${grids.length} footprints lie far outside the site grid and were dropped.`);
  return grids.map((g, i) => (distances[i] <= farM ? g : []));
}
