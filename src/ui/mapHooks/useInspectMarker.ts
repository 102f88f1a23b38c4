/** Marks the inspected point on the map, with the path from the radar whose profile is shown. */
import { useEffect, useMemo } from "react";
import L from "../../map/leaflet";
import { useMapLayer } from "../../map/useLeafletMap";
import { useCoverage } from "../coverageState";
import { radarsByPd } from "../selection";
import { useSession } from "../session";
import { usePlanStore } from "../store";

export function useInspectMarker(map: L.Map | null): void {
  const group = useMemo(() => L.layerGroup(), []);
  useMapLayer(map, group);
  const inspect = useSession((s) => s.inspect);
  const profilePostId = useSession((s) => s.profilePostId);
  const point = useCoverage((s) => s.point);
  const plan = usePlanStore((s) => s.plan);
  useEffect(() => {
    group.clearLayers();
    if (!inspect) return;
    const at: [number, number] = [inspect.latDeg, inspect.lonDeg];
    const postId = profilePostId ?? radarsByPd(point)[0]?.postId;
    const post = plan?.posts.find((p) => p.id === postId);
    if (post) {
      const path: [number, number][] = [[post.position.latDeg, post.position.lonDeg], at];
      // A light casing under the dashed path keeps it readable over any layer.
      group.addLayer(L.polyline(path, { color: "#fff", weight: 6, opacity: 0.8, interactive: false }));
      group.addLayer(L.polyline(path, { color: "#e07a00", weight: 3, dashArray: "8 5", interactive: false }));
    }
    group.addLayer(
      L.circleMarker(at, { radius: 7, color: "#e07a00", weight: 3, fill: false, interactive: false }),
    );
  }, [inspect, profilePostId, point, plan, group]);
}
