/**
 * The coverage figures of a run as a JSON document (for the CLI's --out and --json, the app's export
 * and the report), and as text table rows. Areas in m² and hectares from cell counts on the metric
 * grid; positions also in WGS 84 lon/lat. The assumptions behind the figures travel with them.
 */
import { REASON_TEXT } from "../coverage/coverage.ts";
import type { PreparedSite, SiteResult } from "../coverage/evaluate.ts";
import type { HeightMetrics } from "../coverage/metrics.ts";
import type { SiteGrid } from "./siteGrid.ts";

const M2_PER_HECTARE = 10_000;

export interface MetricsDocument {
  site: string;
  grid: { epsg: number; width: number; height: number; cellSizeM: number; originX: number; originY: number };
  assumptions: {
    effectiveEarthFactor: number;
    maskMode: string;
    ground: "dem" | "flat";
    requiredPd: number;
    pfa: number;
    looks: number;
  };
  radars: {
    id: string;
    name: string;
    modelId: string;
    lonDeg: number;
    latDeg: number;
    antennaHeightAslM: number;
  }[];
  targets: {
    id: string;
    name: string;
    requirementApplies: boolean;
    heights: (HeightMetrics & { largestGapLonLat: [number, number] | null })[];
  }[];
  reasonCodes: Record<string, string>;
  warnings: string[];
  timingsMs: SiteResult["timingsMs"];
}

/** The metrics document of one run. */
export function metricsDocument(site: PreparedSite, result: SiteResult, grid: SiteGrid): MetricsDocument {
  return {
    site: site.name,
    grid: {
      epsg: grid.epsg,
      width: site.frame.width,
      height: site.frame.height,
      cellSizeM: site.frame.cellSizeM,
      originX: site.frame.originX,
      originY: site.frame.originY,
    },
    assumptions: {
      effectiveEarthFactor: site.effectiveEarthFactor,
      maskMode: site.maskMode,
      ground: site.groundSource,
      requiredPd: site.requirement.requiredPd,
      pfa: site.requirement.pfa,
      looks: site.requirement.looks,
    },
    radars: site.radars.map((r) => {
      const [lonDeg, latDeg] = grid.toLonLat(r.x, r.y);
      return {
        id: r.id,
        name: r.name,
        modelId: r.model.id,
        lonDeg,
        latDeg,
        antennaHeightAslM: r.antennaHeightAslM,
      };
    }),
    targets: result.targets.map((t) => ({
      id: t.targetId,
      name: t.name,
      requirementApplies: t.requirementApplies,
      heights: t.heights.map((h) => {
        const c = h.metrics.gaps.largestCentroidXY;
        return { ...h.metrics, largestGapLonLat: c ? grid.toLonLat(c[0], c[1]) : null };
      }),
    })),
    reasonCodes: Object.fromEntries(Object.entries(REASON_TEXT)),
    warnings: site.warnings,
    timingsMs: result.timingsMs,
  };
}

function percent(x: number): string {
  return Number.isFinite(x) ? `${(100 * x).toFixed(1)} %` : "–";
}

function hectares(m2: number): string {
  return (m2 / M2_PER_HECTARE).toFixed(2);
}

/** The coverage table: one row per target class and height. */
export function coverageTableLines(doc: MetricsDocument): string[] {
  const header = [
    "target class",
    "height AGL",
    "protected covered",
    "ring covered",
    "gaps",
    "gap area ha",
    "largest gap ha",
    "≥ 2 radars",
    "inside obstr. ha",
  ];
  const rows: string[][] = [];
  for (const t of doc.targets) {
    for (const h of t.heights) {
      const valid = h.overlapHistogram.reduce((a, b) => a + b, 0);
      const two = h.overlapHistogram.slice(2).reduce((a, b) => a + b, 0);
      rows.push([
        t.id + (t.requirementApplies ? "" : " (info)"),
        `${h.heightAglM} m`,
        percent(h.protectedArea.coveredFraction),
        percent(h.approachRing.coveredFraction),
        String(h.gaps.count),
        hectares(h.gaps.totalAreaM2),
        hectares(h.gaps.largestAreaM2),
        percent(valid > 0 ? two / valid : Number.NaN),
        hectares(h.protectedArea.insideObstructionAreaM2 + h.approachRing.insideObstructionAreaM2),
      ]);
    }
  }
  const widths = header.map((hd, c) => Math.max(hd.length, ...rows.map((r) => r[c].length)));
  const line = (cells: string[]) =>
    cells.map((v, c) => (c < 2 ? v.padEnd(widths[c]) : v.padStart(widths[c]))).join("  ");
  return [line(header), widths.map((w) => "-".repeat(w)).join("  "), ...rows.map(line)];
}
