/**
 * A quick preview site while a post is dragged or turned: the prepared site of the last full run with
 * the changed posts placed again (position, antenna height over the ground there, boresight, tilt),
 * when nothing else changed (terrain, areas, models, settings and the grid frame stay the same).
 * Otherwise null, and the caller prepares the plan in full. Roof footprints are kept from the full run.
 */
import type { PlacedRadar } from "../coverage/coverage";
import type { PreparedSite } from "../coverage/evaluate";
import { sampleBilinear, xToCol, yToRow } from "../coverage/grid";
import type { Plan, Post } from "../io/planSchema";
import { type SiteGrid, siteGridFrame } from "../io/siteGrid";

/** The plan without what a drag changes: the key of everything else. */
export function planKeyWithoutPlacement(plan: Plan): string {
  const posts = plan.posts.map((p) => ({
    id: p.id,
    name: p.name,
    mounting: p.mounting,
    mastHeightM: p.mastHeightM,
    radarModelId: p.radarModelId,
    radarModel: p.radarModel,
    scanSector: p.scanSector ? { widthDeg: p.scanSector.widthDeg } : undefined,
    enabled: p.enabled,
  }));
  return JSON.stringify({ ...plan, posts });
}

function sameFrame(a: SiteGrid["frame"], b: SiteGrid["frame"]): boolean {
  return (
    a.width === b.width &&
    a.height === b.height &&
    a.originX === b.originX &&
    a.originY === b.originY &&
    a.cellSizeM === b.cellSizeM &&
    a.crs === b.crs
  );
}

function replace(r: PlacedRadar, post: Post, site: PreparedSite, grid: SiteGrid): PlacedRadar | null {
  const [x, y] = grid.toGrid(post.position.lonDeg, post.position.latDeg);
  const f = site.frame;
  const col = xToCol(f, x);
  const row = yToRow(f, y);
  const ground = sampleBilinear({ ...f, data: site.ground }, col, row);
  if (!Number.isFinite(ground)) return null;
  const boresightAzDeg = post.scanSector?.centreAzDeg ?? post.boresightAzDeg;
  return { ...r, x, y, antennaHeightAslM: ground + post.mastHeightM, boresightAzDeg, tiltDeg: post.tiltDeg };
}

export function previewSite(
  plan: Plan,
  last: { placementFreeKey: string; site: PreparedSite; grid: SiteGrid },
): PreparedSite | null {
  if (planKeyWithoutPlacement(plan) !== last.placementFreeKey) return null;
  const grid = siteGridFrame(plan);
  if (!sameFrame(grid.frame, last.site.frame)) return null;
  const radars: PlacedRadar[] = [];
  for (const post of plan.posts) {
    if (!post.enabled) continue;
    const r = last.site.radars.find((q) => q.id === post.id);
    if (!r) return null;
    const moved = replace(r, post, last.site, grid);
    if (!moved) return null;
    radars.push(moved);
  }
  return { ...last.site, radars, maskMode: "fast" };
}
