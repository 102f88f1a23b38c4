/**
 * Clicks on the map: place a post (post tool), inspect a point (inspect tool), or choose the building
 * or tree stand under the pointer for editing in the Site panel (no tool). Esc leaves a tool.
 */
import { useEffect } from "react";
import type L from "../../map/leaflet";
import { useCoverage } from "../coverageState";
import { runPoint } from "../engine";
import { addPost, updatePost } from "../planEdits";
import { ROOF_MAST_M } from "../postMoves";
import { obstructionUnder, roofUnder } from "../roofs";
import { selectedSlice } from "../selection";
import { planTabPatch, say, useSession } from "../session";
import { usePlanStore } from "../store";

export function inspectAt(lonDeg: number, latDeg: number): void {
  const s = useSession.getState();
  const plan = usePlanStore.getState().plan;
  const view = useCoverage.getState().view;
  if (!plan) return;
  const slice = selectedSlice(view, s.classId, s.heightM);
  const heightM = slice?.heightM ?? plan.analysis.targetHeightsM[0];
  const classId = slice?.classId ?? plan.targetClasses[0].id;
  s.set({ inspect: { lonDeg, latDeg } });
  void runPoint({ lonDeg, latDeg, heightM, classId });
}

export function useMapClicks(map: L.Map | null): void {
  const tool = useSession((s) => s.tool);
  useEffect(() => {
    if (!map) return;
    const container = map.getContainer();
    container.classList.toggle("tool-crosshair", tool === "post" || tool === "inspect");
    const onClick = (e: L.LeafletMouseEvent) => {
      const t = useSession.getState().tool;
      if (t === "post") {
        const plan = usePlanStore.getState().plan;
        if (!plan) return;
        const { plan: next, id } = addPost(plan, e.latlng.lng, e.latlng.lat);
        const roof = roofUnder(plan, e.latlng.lng, e.latlng.lat);
        usePlanStore
          .getState()
          .change(
            () =>
              roof
                ? updatePost(next, id, { mounting: "roof", mastHeightM: roof.heightM + ROOF_MAST_M })
                : next,
            "add post",
          );
        if (roof)
          say(
            "info",
            `The new post is on a roof ${roof.heightM} m high: mounted at ${roof.heightM + ROOF_MAST_M} m above ground.`,
          );
        useSession.getState().set({ selectedPostId: id, tool: "select" });
      } else if (t === "inspect") {
        inspectAt(e.latlng.lng, e.latlng.lat);
      } else if (t === "select") {
        const plan = usePlanStore.getState().plan;
        if (!plan) return;
        const hit = obstructionUnder(plan, e.latlng.lng, e.latlng.lat);
        useSession.getState().set({ selectedObstruction: hit, ...(hit ? planTabPatch("site") : {}) });
      }
    };
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Escape" && useSession.getState().tool !== "select")
        useSession.getState().set({ tool: "select" });
    };
    map.on("click", onClick);
    window.addEventListener("keydown", onKey);
    return () => {
      map.off("click", onClick);
      window.removeEventListener("keydown", onKey);
    };
  }, [map, tool]);
}
