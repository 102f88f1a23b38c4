/** Protected areas, approach ring, buildings and trees from the plan. */
import { useEffect, useMemo } from "react";
import type L from "../../map/leaflet";
import { SiteLayer } from "../../map/siteLayer";
import { useMapLayer } from "../../map/useLeafletMap";
import { planTabPatch, useSession } from "../session";
import { usePlanStore } from "../store";

export function useSiteLayers(map: L.Map | null): void {
  // Chosen from the keyboard as a click chooses it (useMapClicks): its editor under Site.
  const layer = useMemo(
    () =>
      new SiteLayer((ref) =>
        useSession.getState().set({ selectedObstruction: ref, ...planTabPatch("site") }),
      ),
    [],
  );
  useMapLayer(map, layer);
  // The parts of the plan this layer draws, each kept by reference across edits of other parts: a
  // post moved leaves them as they are, and the layer (with its ring buffered by turf) is not rebuilt.
  const protectedAreas = usePlanStore((s) => s.plan?.protectedAreas);
  const approachRingDepthM = usePlanStore((s) => s.plan?.approachRingDepthM);
  const terrain = usePlanStore((s) => s.plan?.terrain);
  const showBuildings = useSession((s) => s.showBuildings);
  const selected = useSession((s) => s.selectedObstruction);
  useEffect(() => {
    if (!protectedAreas || approachRingDepthM === undefined || !terrain) return;
    layer.setSite({
      protectedAreas,
      approachRingDepthM,
      buildings: terrain.buildings.features,
      treeStands: terrain.treeStands,
      showBuildings,
      selectedBuilding: selected?.kind === "building" ? selected.index : null,
      selectedTreeId: selected?.kind === "tree" ? selected.id : null,
    });
  }, [protectedAreas, approachRingDepthM, terrain, showBuildings, selected, layer]);
}
