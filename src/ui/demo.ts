/**
 * The embedded demo site (demo-sites/ridge-waterworks): its plan comes in as JSON through Vite, its DEM
 * as an asset of the build (same origin, works offline). When the demo is missing, a blank plan opens.
 */
import type { RadarModel } from "../coverage/radarModel";
import type { Plan } from "../io/planSchema";
import type { DemAsset } from "./assets";
import { newPlanAround } from "./newPlan";
import { readPlanText } from "./planText";

const plans = import.meta.glob("../../demo-sites/ridge-waterworks/plan.json", {
  eager: true,
  import: "default",
});
const rasters = import.meta.glob("../../demo-sites/ridge-waterworks/*.{tif,tiff,hgt,asc}", {
  eager: true,
  query: "?url",
  import: "default",
});
const radars = import.meta.glob("../../demo-sites/radars/*.json", { eager: true, import: "default" });

/** Open country for a blank plan (an invented spot). */
const FALLBACK_LON_LAT: [number, number] = [15.3, 47.1];

export async function loadDemo(): Promise<{ plan: Plan; dem: DemAsset | null; problem?: string }> {
  const json = Object.values(plans)[0];
  const models = Object.values(radars) as RadarModel[];
  if (!json)
    return {
      plan: newPlanAround(...FALLBACK_LON_LAT, models),
      dem: null,
      problem: "The demo site is not part of this build.",
    };
  const r = readPlanText(JSON.stringify(json), "the demo plan");
  if (!r.ok)
    return {
      plan: newPlanAround(...FALLBACK_LON_LAT, models),
      dem: null,
      problem: [r.message, ...r.details].join("; "),
    };
  const g = r.plan.terrain.ground;
  let dem: DemAsset | null = null;
  if (g.type === "dem") {
    const entry = Object.entries(rasters).find(([path]) => path.endsWith(`/${g.file}`));
    if (entry) {
      const res = await fetch(entry[1] as string);
      if (res.ok) dem = { fileName: g.file, bytes: await res.arrayBuffer() };
    }
    if (!dem) return { plan: r.plan, dem: null, problem: `The demo DEM ${g.file} could not be loaded.` };
  }
  return { plan: r.plan, dem };
}
