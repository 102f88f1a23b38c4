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
  const col = Math.floor((x - f.originX) / f.cellSizeM);
  const row = Math.floor((f.originY - y) / f.cellSizeM);
  if (!(col >= 0 && col < f.width && row >= 0 && row < f.height)) return null;
  const cellGround = site.ground[row * f.width + col];
  if (Number.isNaN(cellGround)) return null;
  // As preparePlan: bilinear ground under the mast where the neighbours have data, else the cell's own.
  const sampled = sampleBilinear({ ...f, data: site.ground }, xToCol(f, x), yToRow(f, y));
  const footM = Number.isFinite(sampled) ? sampled : cellGround;
  // As preparePlan: a staring radar keeps its pointing under a sector override, others turn to its centre.
  const boresightAzDeg =
    post.scanSector && r.scan.kind !== "staring" ? post.scanSector.centreAzDeg : post.boresightAzDeg;
  return { ...r, x, y, antennaHeightAslM: footM + post.mastHeightM, boresightAzDeg, tiltDeg: post.tiltDeg };
}

export interface PreviewSite {
  site: PreparedSite;
  /** Placement notes for the moved posts, in preparePlan's words (the others keep theirs). */
  warnings: string[];
  /** Ids of the posts whose placement changed. */
  movedIds: string[];
}

/**
 * The last site with the posts placed again. The caller checks first that planKeyWithoutPlacement(plan)
 * is the key the last site was prepared with. With `allowMovedRoofPosts` false (accurate runs), a moved
 * roof post gives null: its own roof footprint must be found again by preparePlan.
 */
export function previewSite(
  plan: Plan,
  last: { site: PreparedSite },
  allowMovedRoofPosts = true,
): PreviewSite | null {
  const grid = siteGridFrame(plan);
  if (!sameFrame(grid.frame, last.site.frame)) return null;
  const radars: PlacedRadar[] = [];
  const warnings: string[] = [];
  const movedIds: string[] = [];
  const f = last.site.frame;
  for (const [i, post] of plan.posts.entries()) {
    if (!post.enabled) continue;
    const r = last.site.radars.find((q) => q.id === post.id);
    if (!r) return null;
    const placed = replace(r, post, last.site, grid);
    if (!placed) return null;
    const moved =
      placed.x !== r.x ||
      placed.y !== r.y ||
      placed.antennaHeightAslM !== r.antennaHeightAslM ||
      placed.boresightAzDeg !== r.boresightAzDeg ||
      placed.tiltDeg !== r.tiltDeg;
    if (moved) {
      if (post.mounting === "roof" && !allowMovedRoofPosts) return null;
      movedIds.push(post.id);
      const col = Math.floor((placed.x - f.originX) / f.cellSizeM);
      const row = Math.floor((f.originY - placed.y) / f.cellSizeM);
      const roofTop = last.site.obstructionTopAglM[row * f.width + col];
      if (roofTop > post.mastHeightM) {
        warnings.push(
          `posts[${i}] (${post.name}): the antenna (${post.mastHeightM} m above ground) is below the roof or canopy at the post (${roofTop.toFixed(1)} m).`,
        );
      }
    }
    radars.push(moved ? placed : r);
  }
  return { site: { ...last.site, radars }, warnings, movedIds };
}
