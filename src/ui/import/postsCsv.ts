/**
 * Candidate posts from a CSV file (papaparse). Recognised position columns, by header name (case and
 * spaces ignored):
 *   lat/latitude + lon/lng/long/longitude (decimal degrees, WGS84; a decimal comma is accepted);
 *   utm_zone (e.g. "33" or "33N"/"33S") + easting + northing (metres, WGS84 UTM);
 *   mgrs (a grid reference such as "33TWN1234567890").
 * Optional: name, mast_height_m, boresight_deg. Every bad row is reported by row number and column.
 */
import { toPoint } from "mgrs";
import Papa from "papaparse";
import proj4 from "proj4";

export interface CsvPost {
  /** 1-based data row number as the user sees it in a spreadsheet (header is row 1). */
  row: number;
  name: string;
  lonDeg: number;
  latDeg: number;
  mastHeightM?: number;
  boresightDeg?: number;
}

export interface CsvRowError {
  row: number;
  column: string;
  message: string;
}

export interface CsvPostsResult {
  posts: CsvPost[];
  errors: CsvRowError[];
  /** Which kind of position columns were found. */
  positionColumns: "latlon" | "utm" | "mgrs" | null;
}

const ALIASES: Record<string, string[]> = {
  lat: ["lat", "latitude", "latdeg"],
  lon: ["lon", "lng", "long", "longitude", "londeg"],
  zone: ["utmzone", "zone"],
  easting: ["easting", "eastingm", "e", "x"],
  northing: ["northing", "northingm", "n", "y"],
  mgrs: ["mgrs", "gridreference", "gridref"],
  name: ["name", "post", "label", "id"],
  mast: ["mastheightm", "mastheight", "mastm", "heightagl", "heightaglm"],
  boresight: ["boresightdeg", "boresight", "azimuthdeg", "azimuth"],
};

function normaliseHeader(h: string): string {
  return h.toLowerCase().replace(/[^a-z0-9]/g, "");
}

/** A number from a cell, accepting one decimal comma ("12,5"); NaN when not a number. */
export function parseNumberCell(text: string): number {
  const t = text.trim();
  if (t === "") return Number.NaN;
  const normalised = /^[+-]?\d+,\d+$/.test(t) ? t.replace(",", ".") : t;
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(normalised)) return Number.NaN;
  return Number(normalised);
}

export function parsePostsCsv(text: string): CsvPostsResult {
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), {
    header: true,
    skipEmptyLines: "greedy",
    delimitersToGuess: [",", ";", "\t"],
    transform: (v) => v,
  });
  const errors: CsvRowError[] = [];
  const headers = parsed.meta.fields ?? [];
  const col: Record<string, string | undefined> = {};
  for (const [key, names] of Object.entries(ALIASES)) {
    col[key] = headers.find((h) => names.includes(normaliseHeader(h)));
  }
  let positionColumns: CsvPostsResult["positionColumns"] = null;
  if (col.lat && col.lon) positionColumns = "latlon";
  else if (col.zone && col.easting && col.northing) positionColumns = "utm";
  else if (col.mgrs) positionColumns = "mgrs";
  if (!positionColumns) {
    errors.push({
      row: 1,
      column: "(header)",
      message: `no position columns: expected lat and lon, or utm_zone, easting and northing, or mgrs (found: ${
        headers.join(", ") || "none"
      })`,
    });
    return { posts: [], errors, positionColumns };
  }
  for (const e of parsed.errors) {
    errors.push({ row: (e.row ?? 0) + 2, column: "(row)", message: e.message });
  }
  const posts: CsvPost[] = [];
  const readRow = (rec: Record<string, string>, row: number): CsvPost | null => {
    const bad = (column: string | undefined, message: string): null => {
      errors.push({ row, column: column ?? "?", message });
      return null;
    };
    const cell = (key: string) => (col[key] ? String(rec[col[key] as string] ?? "") : "");
    let lon = Number.NaN;
    let lat = Number.NaN;
    if (positionColumns === "latlon") {
      lat = parseNumberCell(cell("lat"));
      lon = parseNumberCell(cell("lon"));
      if (!(lat >= -90 && lat <= 90)) return bad(col.lat, `"${cell("lat")}" is not a latitude in −90…90°`);
      if (!(lon >= -180 && lon <= 180))
        return bad(col.lon, `"${cell("lon")}" is not a longitude in −180…180°`);
    } else if (positionColumns === "utm") {
      const zoneText = cell("zone").trim().toUpperCase();
      const m = /^(\d{1,2})\s*([C-X])?$/.exec(zoneText);
      const zone = m ? Number(m[1]) : Number.NaN;
      if (!(zone >= 1 && zone <= 60)) return bad(col.zone, `"${zoneText}" is not a UTM zone 1–60 (e.g. 33N)`);
      const south = m?.[2] ? m[2] === "S" || m[2] < "N" : false;
      const e = parseNumberCell(cell("easting"));
      const n = parseNumberCell(cell("northing"));
      if (!(e >= 100_000 && e <= 900_000))
        return bad(col.easting, `"${cell("easting")}" is not a UTM easting in m`);
      if (!(n >= 0 && n <= 10_000_000))
        return bad(col.northing, `"${cell("northing")}" is not a UTM northing in m`);
      const crs = `+proj=utm +zone=${zone}${south ? " +south" : ""} +datum=WGS84 +units=m +no_defs`;
      [lon, lat] = proj4(crs, "EPSG:4326", [e, n]);
    } else {
      const ref = cell("mgrs").replace(/\s+/g, "");
      try {
        [lon, lat] = toPoint(ref);
      } catch {
        return bad(col.mgrs, `"${ref}" is not an MGRS grid reference`);
      }
      if (!Number.isFinite(lon) || !Number.isFinite(lat))
        return bad(col.mgrs, `"${ref}" is not an MGRS grid reference`);
    }
    const post: CsvPost = { row, name: cell("name").trim() || `Post ${row - 1}`, lonDeg: lon, latDeg: lat };
    if (col.mast && cell("mast").trim() !== "") {
      const h = parseNumberCell(cell("mast"));
      if (!(h >= 0 && h <= 300)) return bad(col.mast, `"${cell("mast")}" is not a mast height in 0–300 m`);
      post.mastHeightM = h;
    }
    if (col.boresight && cell("boresight").trim() !== "") {
      const b = parseNumberCell(cell("boresight"));
      if (!(b >= 0 && b < 360))
        return bad(col.boresight, `"${cell("boresight")}" is not an azimuth in 0–360°`);
      post.boresightDeg = b;
    }
    return post;
  };
  parsed.data.forEach((rec, i) => {
    const post = readRow(rec, i + 2);
    if (post) posts.push(post);
  });
  return { posts, errors, positionColumns };
}

/** One line per error, as shown to the user. */
export function formatCsvErrors(fileName: string, errors: CsvRowError[]): string[] {
  return errors.map((e) => `${fileName}: row ${e.row}, column ${e.column}: ${e.message}`);
}
