/**
 * Import by file picker or drag-and-drop: the kind of file is told from its name (and a zip from its
 * first bytes). DEM (GeoTIFF, .hgt, .asc), buildings and tree stands (GeoJSON, KML/KMZ, OSM export),
 * posts (CSV), a plan (.json with a version) or a bundle (.zip). Each file is read and checked before the
 * plan changes; a file that does not read leaves the plan as it was and says why.
 */

import { parseBuildings } from "../../io/buildings";
import { readAscDem } from "../../io/demAsc";
import { readGeoTiffDem } from "../../io/demGeotiff";
import { readHgtDem } from "../../io/demHgt";
import { errorText } from "../../io/importErrors";
import type { AreaGeometry, BuildingFeature, Plan, TreeStand } from "../../io/planSchema";
import { MAX_RADARS_PER_RUN, siteGridFrame } from "../../io/siteGrid";
import { useAssets } from "../assets";
import { openPlanFile } from "../files";
import { addBuildings, addPost } from "../planEdits";
import { say } from "../session";
import { currentPlan, freshIds, usePlanStore } from "../store";
import { formatCsvErrors, parsePostsCsv } from "./postsCsv";

export type ImportKind =
  | "dem-geotiff"
  | "dem-hgt"
  | "dem-asc"
  | "buildings"
  | "posts"
  | "plan"
  | "bundle"
  | "unknown";

/** The kind of a file from its name (and for .json, from whether it looks like a plan). */
export function importKindOf(fileName: string, head = ""): ImportKind {
  const n = fileName.toLowerCase();
  if (n.endsWith(".tif") || n.endsWith(".tiff")) return "dem-geotiff";
  if (n.endsWith(".hgt")) return "dem-hgt";
  if (n.endsWith(".asc")) return "dem-asc";
  if (n.endsWith(".csv") || n.endsWith(".txt")) return "posts";
  if (n.endsWith(".zip")) return "bundle";
  if (n.endsWith(".kml") || n.endsWith(".kmz") || n.endsWith(".osm") || n.endsWith(".geojson"))
    return "buildings";
  if (n.endsWith(".json"))
    return /"version"\s*:/.test(head) && /"posts"\s*:/.test(head) ? "plan" : "buildings";
  return "unknown";
}

/** Rings in grid metres back to a GeoJSON polygon in lon/lat. */
function ringsToGeometry(
  rings: readonly Float64Array[],
  toLonLat: (x: number, y: number) => [number, number],
) {
  const coordinates = rings.map((r) => {
    const out: number[][] = [];
    for (let i = 0; i + 1 < r.length; i += 2) out.push(toLonLat(r[i], r[i + 1]));
    if (out.length > 0) {
      const a = out[0];
      const b = out[out.length - 1];
      if (a[0] !== b[0] || a[1] !== b[1]) out.push([a[0], a[1]]);
    }
    return out;
  });
  return { type: "Polygon", coordinates } as AreaGeometry;
}

async function importDem(file: File, kind: ImportKind, plan: Plan): Promise<void> {
  const bytes = await file.arrayBuffer();
  const grid = siteGridFrame(plan);
  let warnings: string[];
  if (kind === "dem-geotiff")
    warnings = (await readGeoTiffDem(bytes.slice(0), grid.frame, { fileName: file.name })).warnings;
  else if (kind === "dem-hgt") warnings = readHgtDem(bytes.slice(0), file.name, grid.frame).warnings;
  else
    warnings = readAscDem(new TextDecoder().decode(bytes), grid.frame, undefined, {
      fileName: file.name,
    }).warnings;
  useAssets.getState().setDem({ fileName: file.name, bytes });
  usePlanStore.getState().change(
    (p) => ({
      ...p,
      terrain: {
        ...p.terrain,
        ground: {
          type: "dem",
          file: file.name,
          kind: kind === "dem-geotiff" ? "geotiff" : kind === "dem-hgt" ? "hgt" : "asc",
          surface: "DTM",
        },
      },
    }),
    `DEM ${file.name}`,
  );
  say("info", `Imported the DEM ${file.name} as bare earth (DTM).`, warnings);
}

async function importBuildings(file: File, plan: Plan): Promise<void> {
  const n = file.name.toLowerCase();
  const input = n.endsWith(".kmz") ? await file.arrayBuffer() : await file.text();
  const grid = siteGridFrame(plan);
  const r = parseBuildings(input, file.name, grid.toGrid, { frame: grid.frame });
  const existing = plan.terrain.buildings.features.map((f, i) => ({ id: String(f.id ?? `b${i}`) }));
  const buildingIds = freshIds("building", existing, r.buildings.length);
  const features: BuildingFeature[] = [];
  for (const [k, b] of r.buildings.entries()) {
    features.push({
      type: "Feature",
      id: buildingIds[k],
      geometry: ringsToGeometry(b.rings, grid.toLonLat),
      properties: {
        ...(b.name !== undefined ? { name: b.name } : {}),
        height: b.heightM,
        ...(b.heightSource !== "height" ? { heightSource: b.heightSource } : {}),
        ...(b.minHeightM > 0 ? { min_height: b.minHeightM } : {}),
        source: file.name,
      },
    });
  }
  const treeIds = freshIds("trees", plan.terrain.treeStands, r.treeStands.length);
  const trees: TreeStand[] = [];
  for (const [k, t] of r.treeStands.entries()) {
    trees.push({
      id: treeIds[k],
      name: t.id,
      geometry: ringsToGeometry(t.rings, grid.toLonLat),
      canopyHeightM: t.canopyHeightM,
    });
  }
  if (features.length === 0 && trees.length === 0) {
    say("warning", `${file.name}: no building footprint or tree stand found; nothing was added.`, r.warnings);
    return;
  }
  usePlanStore.getState().change((p) => {
    const withB = addBuildings(p, features);
    return { ...withB, terrain: { ...withB.terrain, treeStands: [...withB.terrain.treeStands, ...trees] } };
  }, `buildings from ${file.name}`);
  say(
    "info",
    `Imported ${features.length} building${features.length === 1 ? "" : "s"} and ${trees.length} tree stand${trees.length === 1 ? "" : "s"} from ${file.name}.`,
    r.warnings,
  );
}

async function importPosts(file: File): Promise<void> {
  const r = parsePostsCsv(await file.text());
  const details = formatCsvErrors(file.name, r.errors);
  if (r.posts.length === 0) {
    say("error", `${file.name}: no post could be read; the plan is unchanged.`, details);
    return;
  }
  // Imported posts are enabled: more than a run takes would block every run (and thousands of
  // markers would hold the page for seconds). Refused whole, before the plan changes.
  const enabled = (usePlanStore.getState().plan?.posts ?? []).filter((p) => p.enabled).length;
  if (enabled + r.posts.length > MAX_RADARS_PER_RUN) {
    say(
      "error",
      `${file.name}: ${r.posts.length} posts would make ${enabled + r.posts.length} enabled posts; at most ${MAX_RADARS_PER_RUN} can take part in one run. Import the candidates in smaller files; the plan is unchanged.`,
      details,
    );
    return;
  }
  usePlanStore.getState().change((p) => {
    let next = p;
    for (const c of r.posts) {
      next = addPost(next, c.lonDeg, c.latDeg, {
        name: c.name,
        ...(c.mastHeightM !== undefined ? { mastHeightM: c.mastHeightM } : {}),
        ...(c.boresightDeg !== undefined ? { boresightAzDeg: c.boresightDeg } : {}),
      }).plan;
    }
    return next;
  }, `posts from ${file.name}`);
  say(
    details.length ? "warning" : "info",
    `Imported ${r.posts.length} post${r.posts.length === 1 ? "" : "s"} from ${file.name}${details.length ? `; ${details.length} row(s) skipped` : ""}.`,
    details,
  );
}

/** Imports one file; never throws (problems become messages, the plan stays). */
export async function importFile(file: File): Promise<void> {
  const head = (await file.slice(0, 4096).text()).slice(0, 4096);
  const kind = importKindOf(file.name, head);
  try {
    const plan = currentPlan();
    if (kind === "dem-geotiff" || kind === "dem-hgt" || kind === "dem-asc") await importDem(file, kind, plan);
    else if (kind === "buildings") await importBuildings(file, plan);
    else if (kind === "posts") await importPosts(file);
    else if (kind === "plan" || kind === "bundle") await openPlanFile(file);
    else
      say(
        "error",
        `${file.name}: not a file Picket imports (DEM .tif/.hgt/.asc, buildings .geojson/.kml/.kmz/.osm, posts .csv, plan .json, bundle .zip).`,
      );
  } catch (e) {
    say("error", `${file.name} could not be imported; the plan is unchanged.`, [errorText(e)]);
  }
}

export async function importFiles(files: Iterable<File>): Promise<void> {
  for (const f of files) await importFile(f);
}
