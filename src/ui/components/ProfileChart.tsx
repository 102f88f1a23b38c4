/**
 * Terrain profile chart (Observable Plot, loaded on first use): ground and obstructions lowered by the
 * Earth-curvature drop (so the straight sight line is straight), the sight line from antenna to target,
 * the first Fresnel zone around it, and the ground as it would be on a flat Earth for comparison.
 */
import * as Plot from "@observablehq/plot";
import { useEffect, useRef } from "react";
import type { ProfileData } from "../../workers/protocol";

export default function ProfileChart({ profile, title }: { profile: ProfileData; title: string }) {
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const n = profile.distanceM.length;
    const last = profile.distanceM[n - 1] || 1;
    const targetCurved = profile.targetAmslM - profile.curvatureDropM[n - 1];
    const rows = profile.distanceM.map((d, i) => {
      const t = d / last;
      const sight = profile.antennaAmslM + (targetCurved - profile.antennaAmslM) * t;
      return {
        d,
        ground: profile.groundAmslM[i] - profile.curvatureDropM[i],
        surface: profile.surfaceAmslM[i] - profile.curvatureDropM[i],
        flat: profile.groundAmslM[i],
        sight,
        lo: sight - profile.fresnelRadiusM[i],
        hi: sight + profile.fresnelRadiusM[i],
      };
    });
    const lows = rows.map((r) => Math.min(r.ground, r.lo)).filter(Number.isFinite);
    const bottom = Math.min(...lows) - 5;
    const chart = Plot.plot({
      title,
      width: 420,
      height: 220,
      marginLeft: 48,
      x: { label: "Distance from the radar (m)" },
      y: { label: "Height above sea level (m)", grid: true },
      marks: [
        Plot.areaY(rows, { x: "d", y1: bottom, y2: "surface", fill: "#8c7b70", fillOpacity: 0.7 }),
        Plot.areaY(rows, { x: "d", y1: bottom, y2: "ground", fill: "#b9a58f" }),
        Plot.lineY(rows, { x: "d", y: "flat", stroke: "#555", strokeDasharray: "3 3", strokeWidth: 1 }),
        Plot.areaY(rows, { x: "d", y1: "lo", y2: "hi", fill: "#e07a00", fillOpacity: 0.18 }),
        Plot.lineY(rows, { x: "d", y: "sight", stroke: "#1d3557", strokeWidth: 1.5 }),
        Plot.dot([{ d: 0, h: profile.antennaAmslM }], { x: "d", y: "h", fill: "#1d3557", r: 4 }),
        Plot.dot([{ d: last, h: targetCurved }], { x: "d", y: "h", fill: "#e07a00", r: 4 }),
      ],
    });
    el.replaceChildren(chart);
    return () => chart.remove();
  }, [profile, title]);
  return (
    <figure className="profile-chart" data-testid="profile-chart">
      <div ref={ref} />
      <figcaption>
        Brown: ground and obstructions (Earth curvature applied, k as set); dashed: ground on a flat Earth;
        blue: sight line; orange band: first Fresnel zone.
      </figcaption>
    </figure>
  );
}
