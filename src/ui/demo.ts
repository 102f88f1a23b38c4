/**
 * The embedded demo sites (demo-sites/*): their plans come in as JSON through Vite, their DEMs as
 * assets of the build (same origin, works offline, fetched only when a site is opened). The planner
 * opens on the first (DEFAULT_DEMO); the others are offered beside the recent plans. When the demo is
 * missing, a blank plan opens.
 */
import type { RadarModel } from "../coverage/radarModel";
import type { Plan } from "../io/planSchema";
import type { DemAsset } from "./assets";
import { newPlanAround } from "./newPlan";
import { readPlanText } from "./planText";

/** The demo the planner opens on: a ridge and tall buildings, so blind spots show at once. */
export const DEFAULT_DEMO = "ridge-waterworks";

const plans = import.meta.glob("../../demo-sites/*/plan.json", { eager: true, import: "default" });
const rasters = import.meta.glob("../../demo-sites/*/*.{tif,tiff,hgt,asc}", {
  eager: true,
  query: "?url",
  import: "default",
});
const radars = import.meta.glob("../../demo-sites/radars/*.json", { eager: true, import: "default" });

/** Open country for a blank plan (an invented spot). */
const FALLBACK_LON_LAT: [number, number] = [15.3, 47.1];

/** The folder name of a demo site from its plan's path. */
function siteIdOf(path: string): string {
  return path.split("/").slice(-2, -1)[0];
}

/** The demo sites of this build, the default first: id (folder) and site name. */
export function demoSites(): { id: string; name: string }[] {
  return Object.entries(plans)
    .map(([path, json]) => ({
      id: siteIdOf(path),
      name: String((json as { site?: { name?: unknown } }).site?.name ?? siteIdOf(path)),
    }))
    .sort(
      (a, b) => Number(b.id === DEFAULT_DEMO) - Number(a.id === DEFAULT_DEMO) || a.id.localeCompare(b.id),
    );
}

export async function loadDemo(
  id = DEFAULT_DEMO,
): Promise<{ plan: Plan; dem: DemAsset | null; problem?: string; missing?: true }> {
  const json = Object.entries(plans).find(([path]) => siteIdOf(path) === id)?.[1];
  const models = Object.values(radars) as RadarModel[];
  if (!json)
    return {
      plan: newPlanAround(...FALLBACK_LON_LAT, models),
      dem: null,
      problem: `The demo site ${id} is not part of this build.`,
      missing: true,
    };
  const r = readPlanText(JSON.stringify(json), "the demo plan");
  if (!r.ok)
    return {
      plan: newPlanAround(...FALLBACK_LON_LAT, models),
      dem: null,
      problem: [r.message, ...r.details].join("; "),
      missing: true,
    };
  const g = r.plan.terrain.ground;
  let dem: DemAsset | null = null;
  if (g.type === "dem") {
    const entry = Object.entries(rasters).find(([path]) => path.endsWith(`/${id}/${g.file}`));
    if (entry) {
      const res = await fetch(entry[1] as string);
      if (res.ok) dem = { fileName: g.file, bytes: await res.arrayBuffer() };
    }
    if (!dem) return { plan: r.plan, dem: null, problem: `The demo DEM ${g.file} could not be loaded.` };
  }
  return { plan: r.plan, dem };
}
