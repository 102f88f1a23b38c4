/**
 * The site grid frame: the local metric frame every raster of a run shares.
 *
 * - Projection: the UTM zone (WGS84) of the site centre (centre of the lon/lat bounding box of the
 *   protected areas), via proj4. Southern sites use the false northing of 10 000 km (+south).
 *   The exceptions of the UTM system are handled: zone 32V widened over south-west Norway
 *   (56°–64° N, 3°–12° E) and zones 31X/33X/35X/37X over Svalbard (72°–84° N); the zones 32X,
 *   34X and 36X do not exist. UTM is defined from 80° S to 84° N; polar sites (UPS) are refused.
 *   Sites across the antimeridian are refused.
 * - Extent: the protected areas expanded by the approach-ring depth (the bounding box of a polygon
 *   buffered by d is its bounding box grown by d on every side), joined with every post, grown by
 *   a margin; snapped outward to whole cells so that the origin is a multiple of the cell size.
 * - Cells: square; with cellSizeM "auto" the smallest of AUTO_CELL_SIZES_M that keeps the count
 *   at or below MAX_AUTO_CELLS and the run's memory estimate inside the budget.
 * - Memory: estimateRunMemoryBytes gives what a run stores on the planner's workers and page (formula
 *   below); checkRunMemory refuses a run above RUN_MEMORY_BUDGET_BYTES with a message that says what
 *   to change.
 */
import proj4 from "proj4";
import type { GridFrame } from "../coverage/grid.ts";
import type { Plan } from "./planSchema.ts";

/**
 * Cap on the cell count of an automatic grid: 4 M cells (e.g. 2000 × 2000, 10 km × 10 km at 5 m).
 * The engine's interactive target is a full 10-radar, 3-height evaluation of 4 M cells in 1.5 s
 * on two cores; such a run with one target class (about 2.7 GiB by estimateRunMemoryBytes) stays
 * inside RUN_MEMORY_BUDGET_BYTES. A run that would not (more classes, radars or heights) takes the
 * next larger cell size instead (autoCellSizeM).
 */
export const MAX_AUTO_CELLS = 4_000_000;

/** Cell sizes tried in order when cellSizeM is "auto", m; 5 m is the default of the design. */
export const AUTO_CELL_SIZES_M: readonly number[] = [5, 10, 20, 25, 50, 100, 200, 250, 500, 1000];

/** Margin of the grid beyond the approach ring and the posts, m, when the plan states none. */
export const DEFAULT_GRID_MARGIN_M = 200;

/** Southern limit of the UTM system, degrees (NGA standard; UPS covers the pole). */
export const UTM_MIN_LAT_DEG = -80;
/** Northern limit of the UTM system, degrees (NGA standard; UPS covers the pole). */
export const UTM_MAX_LAT_DEG = 84;

/**
 * Largest side of a site grid, m. A site centred on a zone edge then reaches 100 km into the
 * neighbouring zone, about 430 km from the central meridian at the equator, where the UTM point
 * scale is about 1.002 (grid areas 0.4 % too large); beyond that a single UTM frame is no longer fit.
 */
export const MAX_GRID_SIDE_M = 200_000;

/**
 * Memory budget of one run, bytes: 4 GiB, about half of a machine of 8 GB. The browser is not the
 * limit: headless Chromium 156 on Linux held 8 GiB of typed arrays in one tab's two workers
 * (docs/performance.md, 4 December 2026). A run's memory is estimated before it starts
 * (estimateRunMemoryBytes) and one above the budget is refused.
 */
export const RUN_MEMORY_BUDGET_BYTES = 4 * 1024 ** 3;

/** The most radars one run can fuse (best-radar rasters hold a byte index; 255 means none). */
export const MAX_RADARS_PER_RUN = 254;

// Bytes per cell as the planner stores a run (Float32 = 4 bytes, Uint8 = 1, Int16 = 2), measured
// against the engine in tests/unit/runMemory.test.ts.
/**
 * Parts an accurate run is split into, one per worker (the planner's engine.ts), when it has at least
 * as many slices: each part keeps its own copy of the site and of what its slices share.
 */
export const RUN_PARTS = 2;
/**
 * Results a worker keeps per post and mask mode (coverageApi.ts): the newest and two earlier states,
 * so undo and redo of a post's last two moves cost nothing.
 */
export const KEPT_RESULTS_PER_POST = 3;
/** Results that left a worker's cache, kept so that the next radar computed writes into their memory. */
export const SPARE_RADAR_RESULTS = 2;
/**
 * Per worker: ground, obstruction surface and obstruction top f32, protected-area and ring masks u8,
 * the horizon sweep's slope and obstacle distance f32 (reused from radar to radar), the merged lowest
 * visible height f32 and a copy made ready for the next run.
 */
export const WORKER_BYTES_PER_CELL = 3 * 4 + 2 * 1 + 2 * 4 + 2 * 4;
/** Per worker and height: the cell state u8 (open air, or inside a roof or canopy). */
export const WORKER_HEIGHT_BYTES_PER_CELL = 1;
/**
 * On the page: ground and obstruction top f32 (hillshade, terrain profile), the hillshade's u8 and
 * two Int16 colour-table index arrays of the coverage layer (drag previews alternate between them).
 */
export const PAGE_BYTES_PER_CELL = 2 * 4 + 1 + 2 * 2;
/** Per radar result and part: its lowest visible height f32. */
export const RADAR_PART_BYTES_PER_CELL = 4;
/** Per radar result and height a part computes: SNR dB f32 (for a 0 dBsm target, shared by the classes). */
export const RADAR_HEIGHT_BYTES_PER_CELL = 4;
/** Per radar result and slice (a class judged at a height): Pd f32 + not-covered reason u8. */
export const RADAR_SLICE_BYTES_PER_CELL = 4 + 1;
/**
 * Radar results a worker keeps beside one per radar: the two earlier places of a moved post (undo and
 * redo cost nothing), two spares whose memory the next radar reuses, and one computed ahead while a
 * dragged post rests (coverageApi.ts). On smaller grids a worker may keep more earlier results, within
 * its cache budget (coverageApi.ts RADAR_CACHE_BUDGET_BYTES).
 */
export const EXTRA_RADAR_RESULTS = KEPT_RESULTS_PER_POST - 1 + SPARE_RADAR_RESULTS + 1;
/**
 * Per slice: the fusion memo's combined Pd f32 and overlap, best radar and gap u8; the copies a view
 * takes to the page (combined Pd f32, overlap and gap u8) and as many made ready for the next run;
 * the page's Pd f32 of the one radar shown.
 */
export const FUSED_SLICE_BYTES_PER_CELL = 4 + 3 + 2 * (4 + 2) + 4;
/** Drag previews run on at most this many cells: a larger grid is previewed on a coarser one (same extent). */
export const PREVIEW_MAX_CELLS = 250_000;
/** Results the preview worker keeps beside one per radar: a moved post's two earlier places and two spares. */
export const EXTRA_PREVIEW_RESULTS = KEPT_RESULTS_PER_POST - 1 + SPARE_RADAR_RESULTS;
/**
 * Per preview cell, besides its radar results (each lowest visible height, SNR and Pd f32 and a
 * reason u8 of the one slice shown): the preview worker's own site and sweep (WORKER_BYTES_PER_CELL
 * and a cell state), its fused slice (FUSED_SLICE_BYTES_PER_CELL), the three previews the page holds
 * (combined Pd, one radar's Pd and lowest visible height f32, overlap and gap u8) and the arrays handed
 * back to the worker for the next ones (at most eight of each kind, f32 and u8: previewMemory.ts,
 * warmBuffers.ts).
 */
export const PREVIEW_BYTES_PER_CELL =
  WORKER_BYTES_PER_CELL +
  WORKER_HEIGHT_BYTES_PER_CELL +
  FUSED_SLICE_BYTES_PER_CELL +
  3 * (3 * 4 + 2) +
  8 * (4 + 1);
/** Per preview cell and radar result: lowest visible height, SNR and Pd f32, reason u8. */
export const PREVIEW_RESULT_BYTES_PER_CELL = 3 * 4 + 1;

/** Thrown by siteGridFrame for a site the grid cannot hold; `name` is stable for the worker boundary. */
export class SiteGridError extends Error {
  override readonly name = "SiteGridError";
  /** The plan field the problem belongs to, e.g. "posts" or "protectedAreas". */
  readonly path: string;
  constructor(path: string, message: string) {
    super(message);
    this.path = path;
  }
}

export interface UtmZone {
  /** Zone number 1–60. */
  zone: number;
  /** True south of the equator (false northing 10 000 km). */
  south: boolean;
}

/**
 * The UTM zone of a point, with the Norway (32V) and Svalbard (31X–37X) exceptions.
 * lonDeg in [-180, 180] (180 belongs to zone 60), latDeg in [-80, 84]; NaN or outside → null.
 */
export function utmZoneOf(lonDeg: number, latDeg: number): UtmZone | null {
  if (!(lonDeg >= -180 && lonDeg <= 180 && latDeg >= UTM_MIN_LAT_DEG && latDeg <= UTM_MAX_LAT_DEG))
    return null;
  let zone = Math.min(60, Math.floor((lonDeg + 180) / 6) + 1);
  if (latDeg >= 56 && latDeg < 64 && lonDeg >= 3 && lonDeg < 12) zone = 32;
  if (latDeg >= 72) {
    if (lonDeg >= 0 && lonDeg < 9) zone = 31;
    else if (lonDeg >= 9 && lonDeg < 21) zone = 33;
    else if (lonDeg >= 21 && lonDeg < 33) zone = 35;
    else if (lonDeg >= 33 && lonDeg < 42) zone = 37;
  }
  return { zone, south: latDeg < 0 };
}

/** The proj4 definition of a UTM zone on WGS84. */
export function utmProj4(z: UtmZone): string {
  return `+proj=utm +zone=${z.zone}${z.south ? " +south" : ""} +datum=WGS84 +units=m +no_defs`;
}

/** The EPSG code of a WGS84 UTM zone (326zz north, 327zz south). */
export function utmEpsg(z: UtmZone): number {
  return (z.south ? 32700 : 32600) + z.zone;
}

const WGS84_LONLAT = "+proj=longlat +datum=WGS84 +no_defs";

export interface SiteGrid {
  frame: GridFrame;
  /** WGS84 lon/lat (degrees) to grid-frame x/y (m); NaN for points the projection cannot take. */
  toGrid(lonDeg: number, latDeg: number): [number, number];
  /** Grid-frame x/y (m) to WGS84 lon/lat (degrees). */
  toLonLat(x: number, y: number): [number, number];
  zone: UtmZone;
  epsg: number;
  /** width × height. */
  cellCount: number;
  /** True when the cell size was chosen automatically. */
  autoCellSize: boolean;
}

function positionsOfPlanAreas(plan: Plan): number[][] {
  const out: number[][] = [];
  for (const area of plan.protectedAreas) {
    const g = area.geometry;
    const polygons = g.type === "Polygon" ? [g.coordinates] : g.coordinates;
    for (const rings of polygons) for (const ring of rings) for (const p of ring) out.push(p);
  }
  return out;
}

/**
 * The cell size an automatic grid takes for an extent of widthM × heightM, m: the smallest of
 * AUTO_CELL_SIZES_M with at most MAX_AUTO_CELLS cells and a run (of runBytesOf(cells) bytes) inside
 * the budget.
 */
export function autoCellSizeM(
  widthM: number,
  heightM: number,
  runBytesOf: (cells: number) => number = () => 0,
  budgetBytes: number = RUN_MEMORY_BUDGET_BYTES,
): number {
  for (const s of AUTO_CELL_SIZES_M) {
    const cells = Math.ceil(widthM / s) * Math.ceil(heightM / s);
    if (cells <= MAX_AUTO_CELLS && runBytesOf(cells) <= budgetBytes) return s;
  }
  return AUTO_CELL_SIZES_M[AUTO_CELL_SIZES_M.length - 1];
}

/**
 * The site grid frame of a validated plan. Throws SiteGridError (with a message for the user)
 * for a site without protected areas, a polar site, one across the antimeridian, or one larger
 * than MAX_GRID_SIDE_M.
 */
export function siteGridFrame(plan: Plan): SiteGrid {
  const areaPositions = positionsOfPlanAreas(plan);
  if (areaPositions.length === 0)
    throw new SiteGridError("protectedAreas", "the site grid needs a protected area");
  let minLon = Number.POSITIVE_INFINITY;
  let maxLon = Number.NEGATIVE_INFINITY;
  let minLat = Number.POSITIVE_INFINITY;
  let maxLat = Number.NEGATIVE_INFINITY;
  const all = [...areaPositions, ...plan.posts.map((p) => [p.position.lonDeg, p.position.latDeg])];
  for (const p of all) {
    minLon = Math.min(minLon, p[0]);
    maxLon = Math.max(maxLon, p[0]);
    minLat = Math.min(minLat, p[1]);
    maxLat = Math.max(maxLat, p[1]);
  }
  if (maxLon - minLon > 180) {
    throw new SiteGridError(
      "protectedAreas",
      "the site crosses the antimeridian (±180° longitude), which the site grid does not support",
    );
  }
  if (minLat < UTM_MIN_LAT_DEG || maxLat > UTM_MAX_LAT_DEG) {
    throw new SiteGridError(
      "protectedAreas",
      `the site reaches latitude ${(minLat < UTM_MIN_LAT_DEG ? minLat : maxLat).toFixed(4)}°, outside the UTM range ${UTM_MIN_LAT_DEG}° to ${UTM_MAX_LAT_DEG}° (polar sites are not supported)`,
    );
  }
  // Centre: of the protected areas only, so that adding a far post never changes the zone.
  let aMinLon = Number.POSITIVE_INFINITY;
  let aMaxLon = Number.NEGATIVE_INFINITY;
  let aMinLat = Number.POSITIVE_INFINITY;
  let aMaxLat = Number.NEGATIVE_INFINITY;
  for (const p of areaPositions) {
    aMinLon = Math.min(aMinLon, p[0]);
    aMaxLon = Math.max(aMaxLon, p[0]);
    aMinLat = Math.min(aMinLat, p[1]);
    aMaxLat = Math.max(aMaxLat, p[1]);
  }
  const zone = utmZoneOf((aMinLon + aMaxLon) / 2, (aMinLat + aMaxLat) / 2);
  if (!zone) throw new SiteGridError("protectedAreas", "the site centre lies outside the UTM system");
  const crs = utmProj4(zone);
  const conv = proj4(WGS84_LONLAT, crs);

  const toGrid = (lonDeg: number, latDeg: number): [number, number] => {
    if (!Number.isFinite(lonDeg) || !Number.isFinite(latDeg)) return [Number.NaN, Number.NaN];
    try {
      const [x, y] = conv.forward([lonDeg, latDeg]);
      return Number.isFinite(x) && Number.isFinite(y) ? [x, y] : [Number.NaN, Number.NaN];
    } catch {
      return [Number.NaN, Number.NaN];
    }
  };
  const toLonLat = (x: number, y: number): [number, number] => {
    if (!Number.isFinite(x) || !Number.isFinite(y)) return [Number.NaN, Number.NaN];
    try {
      const [lon, lat] = conv.inverse([x, y]);
      return Number.isFinite(lon) && Number.isFinite(lat) ? [lon, lat] : [Number.NaN, Number.NaN];
    } catch {
      return [Number.NaN, Number.NaN];
    }
  };

  let minX = Number.POSITIVE_INFINITY;
  let maxX = Number.NEGATIVE_INFINITY;
  let minY = Number.POSITIVE_INFINITY;
  let maxY = Number.NEGATIVE_INFINITY;
  const grow = (x: number, y: number, by: number) => {
    minX = Math.min(minX, x - by);
    maxX = Math.max(maxX, x + by);
    minY = Math.min(minY, y - by);
    maxY = Math.max(maxY, y + by);
  };
  for (const p of areaPositions) {
    const [x, y] = toGrid(p[0], p[1]);
    grow(x, y, plan.approachRingDepthM);
  }
  const areasSideM = Math.max(maxX - minX, maxY - minY);
  const areasBox = { minX, maxX, minY, maxY };
  // The post farthest outside the areas' box (with the ring), named if the grid grows too large.
  let farPost = -1;
  let farPostM = 0;
  plan.posts.forEach((post, i) => {
    const [x, y] = toGrid(post.position.lonDeg, post.position.latDeg);
    grow(x, y, 0);
    const outsideM = Math.max(areasBox.minX - x, x - areasBox.maxX, areasBox.minY - y, y - areasBox.maxY);
    if (!(outsideM <= farPostM)) {
      farPost = i;
      farPostM = outsideM;
    }
  });
  if (!(Number.isFinite(minX) && Number.isFinite(maxX) && Number.isFinite(minY) && Number.isFinite(maxY))) {
    throw new SiteGridError("protectedAreas", "the site could not be projected to its UTM zone");
  }
  const marginM = plan.analysis.marginM ?? DEFAULT_GRID_MARGIN_M;
  minX -= marginM;
  maxX += marginM;
  minY -= marginM;
  maxY += marginM;
  const sideM = Math.max(maxX - minX, maxY - minY);
  if (sideM > MAX_GRID_SIDE_M) {
    const across = `the site grid would be ${(sideM / 1000).toFixed(1)} km across (protected areas, approach ring, posts and margin), above the ${MAX_GRID_SIDE_M / 1000} km limit of one UTM frame`;
    if (areasSideM + 2 * marginM > MAX_GRID_SIDE_M || farPost < 0) {
      throw new SiteGridError("protectedAreas", `${across}; check for a vertex far from the site`);
    }
    const post = plan.posts[farPost];
    const where = Number.isFinite(farPostM) ? `${(farPostM / 1000).toFixed(1)} km outside` : "far from";
    throw new SiteGridError(
      `posts[${farPost}].position`,
      `${across}: post "${post.name}"${post.enabled ? "" : " (disabled)"} at ${post.position.latDeg}, ${post.position.lonDeg} lies ${where} the protected areas and approach ring; check its coordinates (latitude first)`,
    );
  }
  const autoCellSize = plan.analysis.cellSizeM === "auto";
  const cellSizeM = autoCellSize
    ? autoCellSizeM(maxX - minX, maxY - minY, (cells) =>
        estimateRunMemoryBytes(runSizeOf(plan, { cellCount: cells })),
      )
    : (plan.analysis.cellSizeM as number);
  const originX = Math.floor(minX / cellSizeM) * cellSizeM;
  const originY = Math.ceil(maxY / cellSizeM) * cellSizeM;
  const width = Math.max(1, Math.ceil((maxX - originX) / cellSizeM));
  const height = Math.max(1, Math.ceil((originY - minY) / cellSizeM));
  const frame: GridFrame = { width, height, originX, originY, cellSizeM, crs };
  return { frame, toGrid, toLonLat, zone, epsg: utmEpsg(zone), cellCount: width * height, autoCellSize };
}

/** The size of a run: grid cells, radars taking part, target heights, slices (classes judged per height). */
export interface RunSize {
  cells: number;
  radars: number;
  heights: number;
  /** (height, target class) pairs judged: heights × classes when every class is judged at every height. */
  slices: number;
}

/**
 * Memory a run stores, bytes, on P = min(RUN_PARTS, slices) parts with R radars, H heights, S slices:
 *   cells × ( P · (WORKER_BYTES_PER_CELL + H · WORKER_HEIGHT_BYTES_PER_CELL)
 *           + PAGE_BYTES_PER_CELL
 *           + (R + EXTRA_RADAR_RESULTS) · (P · RADAR_PART_BYTES_PER_CELL
 *                 + min(H · P, H + P − 1) · RADAR_HEIGHT_BYTES_PER_CELL + S · RADAR_SLICE_BYTES_PER_CELL)
 *           + S · FUSED_SLICE_BYTES_PER_CELL )
 *   + min(cells, PREVIEW_MAX_CELLS) × (PREVIEW_BYTES_PER_CELL
 *           + (R + EXTRA_PREVIEW_RESULTS) · PREVIEW_RESULT_BYTES_PER_CELL)
 * = cells × (P·(30 + H) + 13 + (R + 5)·(4P + 4·min(HP, H + P − 1) + 5S) + 23S)
 *   + min(cells, 250 000) × (136 + 13·(R + 4)); no radar keeps no results. The parts split the slices
 * in height order, so they share at most P − 1 heights. Negative or non-finite counts give NaN.
 */
export function estimateRunMemoryBytes(size: RunSize): number {
  const { cells, radars, heights, slices } = size;
  if (
    !(cells >= 0 && radars >= 0 && heights >= 0 && slices >= 0) ||
    !Number.isFinite(cells + radars + heights + slices)
  )
    return Number.NaN;
  const parts = Math.max(1, Math.min(RUN_PARTS, slices));
  const results = radars > 0 ? radars + EXTRA_RADAR_RESULTS : 0;
  const partHeights = Math.min(heights * parts, heights + parts - 1);
  const previewResults = radars > 0 ? radars + EXTRA_PREVIEW_RESULTS : 0;
  const previews =
    Math.min(cells, PREVIEW_MAX_CELLS) *
    (PREVIEW_BYTES_PER_CELL + previewResults * PREVIEW_RESULT_BYTES_PER_CELL);
  return (
    previews +
    cells *
      (parts * (WORKER_BYTES_PER_CELL + heights * WORKER_HEIGHT_BYTES_PER_CELL) +
        PAGE_BYTES_PER_CELL +
        results *
          (parts * RADAR_PART_BYTES_PER_CELL +
            partHeights * RADAR_HEIGHT_BYTES_PER_CELL +
            slices * RADAR_SLICE_BYTES_PER_CELL) +
        slices * FUSED_SLICE_BYTES_PER_CELL)
  );
}

/** Slices of a plan: each class at each of its heights that is an analysis height. */
function slicesOf(plan: Plan): number {
  const heights = new Set(plan.analysis.targetHeightsM);
  return plan.targetClasses.reduce((n, t) => n + t.heightsAglM.filter((h) => heights.has(h)).length, 0);
}

/** The run size of a plan on its grid: enabled posts, analysis heights, judged slices. */
export function runSizeOf(plan: Plan, grid: Pick<SiteGrid, "cellCount">): RunSize {
  return {
    cells: grid.cellCount,
    radars: plan.posts.filter((p) => p.enabled).length,
    heights: plan.analysis.targetHeightsM.length,
    slices: slicesOf(plan),
  };
}

/** "24 MiB" below 1 GiB, "2.73 GiB" from there (binary units, as the memory budget is stated). */
export function formatMemory(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return "—";
  return bytes < 1024 ** 3 ? `${Math.round(bytes / 1024 ** 2)} MiB` : `${(bytes / 1024 ** 3).toFixed(2)} GiB`;
}

export type RunMemoryCheck = { ok: true; bytes: number } | { ok: false; bytes: number; message: string };

/** Whether a run fits the memory budget; a refusal says how much it needs and what to change. */
export function checkRunMemory(size: RunSize, budgetBytes: number = RUN_MEMORY_BUDGET_BYTES): RunMemoryCheck {
  const bytes = estimateRunMemoryBytes(size);
  if (!Number.isFinite(bytes)) {
    return { ok: false, bytes, message: "the size of this run cannot be estimated (invalid counts)" };
  }
  if (size.radars > MAX_RADARS_PER_RUN) {
    return {
      ok: false,
      bytes,
      message: `this run has ${size.radars} enabled posts; at most ${MAX_RADARS_PER_RUN} can take part in one run`,
    };
  }
  if (bytes > budgetBytes) {
    return {
      ok: false,
      bytes,
      message: `this run needs about ${formatMemory(bytes)} (${size.cells.toLocaleString("en-US")} cells, ${size.radars} radars, ${size.heights} heights, ${size.slices} maps of a target class at a height), above the ${formatMemory(budgetBytes)} budget; use a larger analysis.cellSizeM, fewer target heights or classes, or fewer enabled posts`,
    };
  }
  return { ok: true, bytes };
}

/** Largest cell size a plan may set, m (the plan schema's bound). */
const MAX_CELL_SIZE_M = 1000;

/**
 * The smallest cell size, in whole centimetres, at which a run of the plan fits the memory budget,
 * for a refusal to offer: the estimate falls with the square of the cell size, and each candidate is
 * checked on its own grid (snapping the frame to whole cells moves the count a little). The plan's
 * own cell size when it already fits; null when no cell size up to 1000 m helps (too many radars) or
 * the plan has no grid.
 */
export function cellSizeToFitM(plan: Plan, budgetBytes: number = RUN_MEMORY_BUDGET_BYTES): number | null {
  let grid: SiteGrid;
  try {
    grid = siteGridFrame(plan);
  } catch {
    return null;
  }
  const size = runSizeOf(plan, grid);
  if (size.radars > MAX_RADARS_PER_RUN) return null;
  const bytes = estimateRunMemoryBytes(size);
  if (!(bytes > budgetBytes)) return grid.frame.cellSizeM;
  const cmPerM = 100;
  let cell = Math.ceil(grid.frame.cellSizeM * Math.sqrt(bytes / budgetBytes) * cmPerM) / cmPerM;
  while (cell <= MAX_CELL_SIZE_M) {
    const candidate: Plan = { ...plan, analysis: { ...plan.analysis, cellSizeM: cell } };
    try {
      const g = siteGridFrame(candidate);
      if (estimateRunMemoryBytes(runSizeOf(candidate, g)) <= budgetBytes) return cell;
    } catch {
      return null;
    }
    cell = Math.ceil(cell * 1.005 * cmPerM + 1) / cmPerM;
  }
  return null;
}

export type PlanRunCheck =
  | { ok: true; grid: SiteGrid; memoryBytes: number }
  | { ok: false; errors: { path: string; message: string }[] };

/**
 * Everything a run needs to know before it starts, as named errors rather than exceptions:
 * the site grid (a SiteGridError's path and message) and the memory check
 * (→ path "analysis.cellSizeM"). Never throws for a validated plan.
 */
export function checkPlanForRun(plan: Plan, budgetBytes: number = RUN_MEMORY_BUDGET_BYTES): PlanRunCheck {
  let grid: SiteGrid;
  try {
    grid = siteGridFrame(plan);
  } catch (err) {
    if (err instanceof SiteGridError)
      return { ok: false, errors: [{ path: err.path, message: err.message }] };
    return {
      ok: false,
      errors: [{ path: "(plan)", message: `the site grid cannot be built (${String(err)})` }],
    };
  }
  const size = runSizeOf(plan, grid);
  const memory = checkRunMemory(size, budgetBytes);
  if (!memory.ok) {
    const path = size.radars > MAX_RADARS_PER_RUN ? "posts" : "analysis.cellSizeM";
    return { ok: false, errors: [{ path, message: memory.message }] };
  }
  return { ok: true, grid, memoryBytes: memory.bytes };
}
