/**
 * Moving a post, by drag or by typed coordinates: onto a roof it becomes a roof post on a mast above
 * the roof; off every building a roof post becomes a ground mast. One undo step, and a note saying so.
 */
import { updatePost } from "./planEdits";
import { roofUnder } from "./roofs";
import { say } from "./session";
import { usePlanStore } from "./store";

/** Extra mast on a roof above the roof top when a post is snapped to a roof, m. */
export const ROOF_MAST_M = 3;

export function movePostTo(id: string, lonDeg: number, latDeg: number): void {
  const store = usePlanStore.getState();
  const plan = store.plan;
  const post = plan?.posts.find((p) => p.id === id);
  if (!plan || !post) return;
  const position = { lonDeg, latDeg };
  const roof = roofUnder(plan, lonDeg, latDeg);
  if (roof && post.mounting !== "roof") {
    const mast = roof.heightM + ROOF_MAST_M;
    store.change(
      (p) => updatePost(p, id, { position, mounting: "roof", mastHeightM: mast }),
      "move post onto a roof",
    );
    say(
      "info",
      `${post.name} is on a roof ${roof.heightM} m high: mounted at ${mast} m above ground (roof + ${ROOF_MAST_M} m mast). Change it under Posts.`,
    );
  } else if (!roof && post.mounting === "roof") {
    store.change((p) => updatePost(p, id, { position, mounting: "ground" }), "move post off a roof");
    say(
      "info",
      `${post.name} is no longer on a building: now a ground mast of ${post.mastHeightM} m. Check the mast height under Posts.`,
    );
  } else store.change((p) => updatePost(p, id, { position }), "move post");
}
