/**
 * From a validated plan and its loaded files to a PreparedSite the engine runs on: the site grid
 * (siteGrid.ts), ground from the DEM or flat, buildings and tree stands burned on (surfaces.ts),
 * region masks, and every enabled radar placed in grid coordinates. No Node built-ins: the browser
 * uses it as it is. Errors the user must fix are PrepareError with the plan path first.
 */
import type { PlacedRadar } from "../coverage/coverage.ts";
import { type PreparedSite, siteTerrainId } from "../coverage/evaluate.ts";
import { type Grid, sampleBilinear, xToCol, yToRow } from "../coverage/grid.ts";
import type { RadarModel, ScanMode } from "../coverage/radarModel.ts";
import { buildRegionMasks, type PolygonXY, type RingXY } from "../coverage/regionMask.ts";
import { burnObstructions, flatGround, type TreeStandShape } from "../coverage/surfaces.ts";
import { parseBuildings } from "./buildings.ts";
import { readAscDem } from "./demAsc.ts";
import { readGeoTiffDem } from "./demGeotiff.ts";
import { readHgtDem } from "./demHgt.ts";
import type { AreaGeometry, Plan, Post } from "./planSchema.ts";
import { radarModelOfPost } from "./planValidation.ts";
import { checkRunMemory, runSizeOf, type SiteGrid, siteGridFrame } from "./siteGrid.ts";

/** A plan that cannot be prepared; the message starts with the plan path (e.g. "posts[2].position"). */
export class PrepareError extends Error {
  override name = "PrepareError";
}

/** The DEM file a plan refers to, as loaded by the caller (CLI: from disk; app: from the user). */
export interface LoadedDem {
  fileName: string;
  /** Bytes for GeoTIFF and .hgt (and zipped .hgt), text for an Esri ASCII grid. */
  data: ArrayBuffer | string;
  /** The .prj beside an ASCII grid, when there is one. */
  prjWkt?: string;
}

export interface PreparedPlan {
  site: PreparedSite;
  /** The site grid with its lon/lat conversions (kept by the caller; not transferable). */
  grid: SiteGrid;
  /** Plain-language notes (import, placement, flat ground). */
  warnings: string[];
}

/** A roof's own building is searched this far around a roof post, m. */
const ROOF_SEARCH_RADIUS_M = 250;

function polygonsOf(g: AreaGeometry): number[][][][] {
  return g.type === "Polygon" ? [g.coordinates] : g.coordinates;
}

function toGridPolygons(g: AreaGeometry, toGrid: SiteGrid["toGrid"]): PolygonXY[] {
  return polygonsOf(g).map((rings) =>
    rings.map((ring) => ring.map((p) => toGrid(p[0], p[1]) as [number, number]) as RingXY),
  );
}

function toFlatRings(g: AreaGeometry, toGrid: SiteGrid["toGrid"]): Float64Array[] {
  const out: Float64Array[] = [];
  for (const rings of polygonsOf(g))
    for (const ring of rings) {
      const flat = new Float64Array(ring.length * 2);
      ring.forEach((p, k) => {
        const [x, y] = toGrid(p[0], p[1]);
        flat[2 * k] = x;
        flat[2 * k + 1] = y;
      });
      out.push(flat);
    }
  return out;
}

async function groundOf(
  plan: Plan,
  grid: SiteGrid,
  dem: LoadedDem | undefined,
  warnings: string[],
): Promise<{ ground: Grid; source: "dem" | "flat"; dsm: boolean }> {
  const g = plan.terrain.ground;
  if (g.type === "flat") {
    warnings.push(
      `No DEM: the ground is flat at ${g.elevationAmslM} m above sea level; terrain masking comes from buildings and trees only.`,
    );
    return { ground: flatGround(grid.frame, g.elevationAmslM), source: "flat", dsm: false };
  }
  if (dem === undefined) throw new PrepareError(`terrain.ground.file: "${g.file}" was not loaded`);
  const fileName = dem.fileName;
  let result: Awaited<ReturnType<typeof readGeoTiffDem>>;
  if (g.kind === "geotiff") {
    if (typeof dem.data === "string")
      throw new PrepareError(`terrain.ground.file: "${fileName}" must be read as bytes`);
    result = await readGeoTiffDem(dem.data, grid.frame, {
      fileName,
      surfaceKind: g.surface === "DSM" ? "dsm" : "dtm",
    });
  } else if (g.kind === "hgt") {
    if (typeof dem.data === "string")
      throw new PrepareError(`terrain.ground.file: "${fileName}" must be read as bytes`);
    result = readHgtDem(dem.data, fileName, grid.frame);
  } else {
    const text = typeof dem.data === "string" ? dem.data : new TextDecoder().decode(dem.data);
    result = readAscDem(text, grid.frame, dem.prjWkt, { fileName });
  }
  warnings.push(...result.warnings);
  return { ground: result.ground, source: "dem", dsm: g.surface === "DSM" };
}

/**
 * Radius of the building a roof post stands on, m: the farthest cell of the 8-connected block of
 * obstruction cells (top > 0) that holds the post's cell, searched within ROOF_SEARCH_RADIUS_M.
 * 0 when the post's cell is open ground.
 */
function roofRadiusM(
  site: { obstructionTopAglM: Float32Array },
  grid: SiteGrid,
  col: number,
  row: number,
): number {
  const { width, height, cellSizeM } = grid.frame;
  const top = site.obstructionTopAglM;
  const start = row * width + col;
  if (!(top[start] > 0)) return 0;
  const limitCells = Math.ceil(ROOF_SEARCH_RADIUS_M / cellSizeM);
  const seen = new Set<number>([start]);
  const stack = [start];
  let farthest2 = 0;
  while (stack.length > 0) {
    const i = stack.pop()!;
    const r = (i / width) | 0;
    const c = i - r * width;
    const d2 = (r - row) ** 2 + (c - col) ** 2;
    if (d2 > farthest2) farthest2 = d2;
    for (let dr = -1; dr <= 1; dr++)
      for (let dc = -1; dc <= 1; dc++) {
        const rr = r + dr;
        const cc = c + dc;
        if (rr < 0 || rr >= height || cc < 0 || cc >= width) continue;
        if (Math.abs(rr - row) > limitCells || Math.abs(cc - col) > limitCells) continue;
        const j = rr * width + cc;
        if (!seen.has(j) && top[j] > 0) {
          seen.add(j);
          stack.push(j);
        }
      }
  }
  // To the far edge of the farthest cell.
  return (Math.sqrt(farthest2) + 1) * cellSizeM;
}

/** The post's scan mode after its sector override: a sector of that width centred on the override. */
function scanOf(model: RadarModel, post: Post): { scan: ScanMode; boresightAzDeg: number } {
  const o = post.scanSector;
  if (o === undefined) return { scan: model.scan, boresightAzDeg: post.boresightAzDeg };
  if (model.scan.kind === "staring") {
    // A staring radar keeps its pointing; the override only narrows its field.
    return {
      scan: { ...model.scan, fovAzDeg: Math.min(model.scan.fovAzDeg, o.widthDeg) },
      boresightAzDeg: post.boresightAzDeg,
    };
  }
  return {
    scan: { kind: "sector", sectorWidthDeg: o.widthDeg, fovElDeg: model.scan.fovElDeg },
    boresightAzDeg: o.centreAzDeg,
  };
}

/**
 * Prepare a validated plan (planValidation.ts parsePlan) for evaluation.
 * @param dem the plan's DEM file when terrain.ground is a DEM.
 * @throws PrepareError naming the plan path (missing DEM, post without ground, run too large),
 *   SiteGridError from siteGrid.ts, ImportError from the DEM and building readers.
 */
export async function preparePlan(plan: Plan, dem?: LoadedDem): Promise<PreparedPlan> {
  const warnings: string[] = [];
  const grid = siteGridFrame(plan);
  const memory = checkRunMemory(runSizeOf(plan, grid));
  if (!memory.ok) throw new PrepareError(`analysis: ${memory.message}`);
  const { frame, toGrid } = grid;
  const { ground, source, dsm } = await groundOf(plan, grid, dem, warnings);

  const imported = parseBuildings(JSON.stringify(plan.terrain.buildings), "terrain.buildings", toGrid, {
    frame,
  });
  warnings.push(...imported.warnings);
  const trees: TreeStandShape[] = plan.terrain.treeStands.map((t) => ({
    rings: toFlatRings(t.geometry, toGrid),
    canopyHeightM: t.canopyHeightM,
  }));
  if (dsm && (imported.buildings.length > 0 || trees.length > 0)) {
    warnings.push(
      "The DEM is a surface model (DSM) and already holds buildings and trees; the footprints are burned on top of it, which counts them twice.",
    );
  }
  const { surface, obstructionTopAglM } = burnObstructions(ground, imported.buildings, trees);

  const protectedPolygons = plan.protectedAreas.flatMap((a) => toGridPolygons(a.geometry, toGrid));
  const regions = buildRegionMasks(frame, protectedPolygons, plan.approachRingDepthM);

  const radars: PlacedRadar[] = [];
  plan.posts.forEach((post, i) => {
    if (!post.enabled) return;
    const model = radarModelOfPost(plan, post);
    if (model === undefined) throw new PrepareError(`posts[${i}].radarModelId: no such radar model`);
    const [x, y] = toGrid(post.position.lonDeg, post.position.latDeg);
    const col = Math.floor((x - frame.originX) / frame.cellSizeM);
    const row = Math.floor((frame.originY - y) / frame.cellSizeM);
    if (!(col >= 0 && col < frame.width && row >= 0 && row < frame.height)) {
      throw new PrepareError(`posts[${i}].position: the post lies outside the site grid`);
    }
    const groundM = ground.data[row * frame.width + col];
    if (Number.isNaN(groundM)) {
      throw new PrepareError(
        `posts[${i}].position: no ground elevation at the post (${post.position.latDeg}, ${post.position.lonDeg}); the DEM does not reach it`,
      );
    }
    // Bilinear ground under the mast where the neighbours have data, else the cell's own value.
    const sampled = sampleBilinear(ground, xToCol(frame, x), yToRow(frame, y));
    const footM = Number.isFinite(sampled) ? sampled : groundM;
    const roofTop = obstructionTopAglM[row * frame.width + col];
    let ownFootprintRadiusM = 0;
    if (post.mounting === "roof") {
      ownFootprintRadiusM = roofRadiusM({ obstructionTopAglM }, grid, col, row);
      if (ownFootprintRadiusM === 0) {
        warnings.push(`posts[${i}] (${post.name}): a roof post, but no building lies under it.`);
      }
    }
    if (roofTop > post.mastHeightM) {
      warnings.push(
        `posts[${i}] (${post.name}): the antenna (${post.mastHeightM} m above ground) is below the roof or canopy at the post (${roofTop.toFixed(1)} m).`,
      );
    }
    const { scan, boresightAzDeg } = scanOf(model, post);
    radars.push({
      id: post.id,
      name: post.name,
      model,
      scan,
      x,
      y,
      antennaHeightAslM: footM + post.mastHeightM,
      boresightAzDeg,
      tiltDeg: post.tiltDeg,
      ownFootprintRadiusM,
    });
  });
  if (radars.length === 0) warnings.push("No enabled post: nothing is covered.");

  const heightsAglM = [...plan.analysis.targetHeightsM].sort((a, b) => a - b);
  const site: PreparedSite = {
    name: plan.site.name,
    frame,
    ground: ground.data,
    surface: surface.data,
    obstructionTopAglM,
    regions,
    radars,
    targets: plan.targetClasses.map((t) => ({
      id: t.id,
      name: t.name,
      rcsDbsm: t.rcsDbsm,
      swerling: t.swerling,
      heightsAglM: t.heightsAglM,
    })),
    requirement: {
      requiredPd: plan.requirement.requiredPd,
      pfa: plan.requirement.pfa,
      looks: plan.requirement.looks,
      targetIds: plan.requirement.targetClassIds ?? plan.targetClasses.map((t) => t.id),
    },
    heightsAglM,
    effectiveEarthFactor: plan.analysis.effectiveEarthFactor,
    maskMode: plan.analysis.maskMode,
    groundSource: source,
    warnings,
  };
  // Hash the terrain once here, not on every evaluation (the per-radar cache keys include it).
  site.terrainId = siteTerrainId(site);
  return { site, grid, warnings };
}
