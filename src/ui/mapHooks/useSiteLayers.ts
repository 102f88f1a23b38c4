/** Protected areas, approach ring, buildings and trees from the plan. */
import { useEffect, useMemo } from "react";
import type L from "../../map/leaflet";
import { SiteLayer } from "../../map/siteLayer";
import { useMapLayer } from "../../map/useLeafletMap";
import { useSession } from "../session";
import { usePlanStore } from "../store";

export function useSiteLayers(map: L.Map | null): void {
  const layer = useMemo(() => new SiteLayer(), []);
  useMapLayer(map, layer);
  const plan = usePlanStore((s) => s.plan);
  const showBuildings = useSession((s) => s.showBuildings);
  useEffect(() => {
    if (!plan) return;
    layer.setSite({
      protectedAreas: plan.protectedAreas,
      approachRingDepthM: plan.approachRingDepthM,
      buildings: plan.terrain.buildings.features,
      treeStands: plan.terrain.treeStands,
      showBuildings,
    });
  }, [plan?.protectedAreas, plan?.approachRingDepthM, plan?.terrain, showBuildings, layer, plan]);
}
