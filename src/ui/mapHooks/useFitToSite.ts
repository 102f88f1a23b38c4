/** Fits the map to the protected areas and posts whenever a different plan is loaded. */
import { useEffect, useRef } from "react";
import L from "../../map/leaflet";
import { usePlanStore } from "../store";

export function useFitToSite(map: L.Map | null): void {
  const plan = usePlanStore((s) => s.plan);
  const loadCount = usePlanStore((s) => s.loadCount);
  const fitted = useRef<number | null>(null);
  useEffect(() => {
    if (!map || !plan) return;
    if (fitted.current === loadCount) return;
    fitted.current = loadCount;
    const pts: [number, number][] = [];
    for (const a of plan.protectedAreas) {
      const polys = a.geometry.type === "Polygon" ? [a.geometry.coordinates] : a.geometry.coordinates;
      for (const poly of polys) for (const p of poly[0]) pts.push([p[1], p[0]]);
    }
    for (const p of plan.posts) pts.push([p.position.latDeg, p.position.lonDeg]);
    if (pts.length > 0) map.fitBounds(L.latLngBounds(pts).pad(0.12), { animate: false });
  }, [map, plan, loadCount]);
}
