/**
 * Moving a post, by drag or by typed coordinates: onto a roof it becomes a roof post on a mast above
 * the roof; off every building a roof post becomes a ground mast. One undo step, and a note saying so.
 */
import type { Plan } from "../io/planSchema";
import { updatePost } from "./planEdits";
import { roofUnder } from "./roofs";
import { say } from "./session";
import { usePlanStore } from "./store";

/** Extra mast on a roof above the roof top when a post is snapped to a roof, m. */
export const ROOF_MAST_M = 3;

/** Post `id` of `plan` moved to a place, as a drop there makes it; null when there is no such post. */
export function movedPost(
  plan: Plan,
  id: string,
  lonDeg: number,
  latDeg: number,
): { plan: Plan; label: string; note: string | null } | null {
  const post = plan.posts.find((p) => p.id === id);
  if (!post) return null;
  const position = { lonDeg, latDeg };
  const roof = roofUnder(plan, lonDeg, latDeg);
  if (roof && post.mounting !== "roof") {
    const mast = roof.heightM + ROOF_MAST_M;
    return {
      plan: updatePost(plan, id, { position, mounting: "roof", mastHeightM: mast }),
      label: "move post onto a roof",
      note: `${post.name} is on a roof ${roof.heightM} m high: mounted at ${mast} m above ground (roof + ${ROOF_MAST_M} m mast). Change it under Posts.`,
    };
  }
  if (!roof && post.mounting === "roof")
    return {
      plan: updatePost(plan, id, { position, mounting: "ground" }),
      label: "move post off a roof",
      note: `${post.name} is no longer on a building: now a ground mast of ${post.mastHeightM} m. Check the mast height under Posts.`,
    };
  return { plan: updatePost(plan, id, { position }), label: "move post", note: null };
}

export function movePostTo(id: string, lonDeg: number, latDeg: number): void {
  const store = usePlanStore.getState();
  const plan = store.plan;
  const moved = plan ? movedPost(plan, id, lonDeg, latDeg) : null;
  if (!moved) return;
  store.change(() => moved.plan, moved.label);
  if (moved.note) say("info", moved.note);
}
