/**
 * Drawing geometry around a point: an azimuthal equidistant projection centred on the point (proj4
 * +proj=aeqd) keeps distances and azimuths from the centre true, so sector edges, range rings and the
 * boresight handle land where the radar's numbers say. For drawing only; report figures use the site grid.
 */
import proj4 from "proj4";
import { degToRad, radToDeg, wrapDeg360 } from "../coverage/units";

interface Conv {
  forward(p: [number, number]): number[];
  inverse(p: [number, number]): number[];
}
const cache = new Map<string, Conv>();
const CACHE_LIMIT = 64;

function around(lonDeg: number, latDeg: number): Conv {
  const key = `${lonDeg.toFixed(7)},${latDeg.toFixed(7)}`;
  let c = cache.get(key);
  if (!c) {
    c = proj4(
      "EPSG:4326",
      `+proj=aeqd +lat_0=${latDeg} +lon_0=${lonDeg} +datum=WGS84 +units=m +no_defs`,
    ) as unknown as Conv;
    if (cache.size >= CACHE_LIMIT) cache.clear();
    cache.set(key, c);
  }
  return c;
}

/** The point `distanceM` from (lon, lat) on azimuth `azDeg` (clockwise from true north), as [lat, lon] for Leaflet. */
export function destinationLatLng(
  lonDeg: number,
  latDeg: number,
  azDeg: number,
  distanceM: number,
): [number, number] {
  const a = degToRad(azDeg);
  const [lon, lat] = around(lonDeg, latDeg).inverse([distanceM * Math.sin(a), distanceM * Math.cos(a)]);
  return [lat, lon];
}

/** Azimuth (degrees clockwise from true north, [0, 360)) and distance (m) from a centre to a point. */
export function azimuthAndDistance(
  fromLonDeg: number,
  fromLatDeg: number,
  toLonDeg: number,
  toLatDeg: number,
): { azDeg: number; distanceM: number } {
  const [x, y] = around(fromLonDeg, fromLatDeg).forward([toLonDeg, toLatDeg]);
  return { azDeg: wrapDeg360(radToDeg(Math.atan2(x, y))), distanceM: Math.hypot(x, y) };
}

/** Points every `stepDeg` along an arc (or a full circle when widthDeg ≥ 360), as [lat, lon]. */
export function arcLatLngs(
  lonDeg: number,
  latDeg: number,
  centreAzDeg: number,
  widthDeg: number,
  radiusM: number,
  stepDeg = 3,
): [number, number][] {
  const full = widthDeg >= 360;
  const start = full ? 0 : centreAzDeg - widthDeg / 2;
  const span = full ? 360 : widthDeg;
  const n = Math.max(2, Math.ceil(span / stepDeg));
  const out: [number, number][] = [];
  for (let i = 0; i <= n; i++) out.push(destinationLatLng(lonDeg, latDeg, start + (span * i) / n, radiusM));
  return out;
}
