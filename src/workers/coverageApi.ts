/**
 * The coverage API as it runs inside a worker (or inline with pool size 0): checks the request, prepares
 * the site (src/io/preparePlan.ts, cached while terrain and grid stay the same), and calls the engine
 * (src/coverage/evaluate.ts) with a per-radar cache, so moving one post recomputes one radar.
 */
import type { PlacedRadar, RadarCoverage } from "../coverage/coverage";
import { evaluatePoint, evaluateSite, type PreparedSite, siteTerrainId } from "../coverage/evaluate";
import { linkBudget } from "../coverage/linkBudget";
import { RadarResultCache } from "../coverage/radarCache";
import { parsePlan } from "../io/planValidation";
import { preparePlan } from "../io/preparePlan";
import type { SiteGrid } from "../io/siteGrid";
import { gapShapesXY } from "./gapContours";
import { azimuthAndDistanceXY } from "./geometry";
import { planKeyWithoutPlacement, previewSite } from "./preview";
import { terrainProfile } from "./profile";
import type {
  CoverageApi,
  CoverageView,
  DemPayload,
  EvaluateRequest,
  PointRadar,
  PointReply,
  PointRequest,
} from "./protocol";
import { cloneView, toCoverageView } from "./toView";

/** Per-radar results kept (two mask modes × a few edits of each radar). */
const RADAR_CACHE_ENTRIES = 64;

function now(): number {
  return performance.now();
}

/** A request whose plan does not validate: the message names the fields. */
export class BadRequestError extends Error {
  override name = "BadRequestError";
}

/** The site limited to one class at one height (a preview computes only what the map shows). */
function focusSite(site: PreparedSite, focus: { classId: string; heightM: number }): PreparedSite {
  const target = site.targets.find((t) => t.id === focus.classId);
  if (!target || !site.heightsAglM.includes(focus.heightM) || !target.heightsAglM.includes(focus.heightM))
    return site;
  return {
    ...site,
    targets: [{ ...target, heightsAglM: [focus.heightM] }],
    heightsAglM: [focus.heightM],
    requirement: {
      ...site.requirement,
      targetIds: site.requirement.targetIds.filter((id) => id === focus.classId),
    },
  };
}

export function createCoverageApi(): CoverageApi & { lastSite(): PreparedSite | null } {
  const cache = new RadarResultCache<RadarCoverage>(RADAR_CACHE_ENTRIES);
  let prepared: {
    key: string;
    placementFreeKey: string;
    site: PreparedSite;
    warnings: string[];
    grid: SiteGrid;
  } | null = null;

  const parse = (planInput: unknown) => {
    const parsed = parsePlan(planInput);
    if (!parsed.ok) throw new BadRequestError(parsed.errors.map((e) => `${e.path}: ${e.message}`).join("; "));
    return parsed.plan;
  };

  const prepare = async (
    planInput: unknown,
    dem: DemPayload | null,
    maskMode?: "accurate" | "fast",
  ): Promise<PreparedSite> => {
    const plan = parse(planInput);
    const demKey = [dem?.fileName ?? null, dem?.bytes.byteLength ?? 0];
    const key = JSON.stringify([plan, demKey]);
    const placementFreeKey = JSON.stringify([planKeyWithoutPlacement(plan), demKey]);
    let current = prepared;
    if (current?.key === key) return maskMode ? { ...current.site, maskMode } : current.site;
    if (maskMode === "fast" && current) {
      const quick = previewSite(plan, { ...current, placementFreeKey: current.placementFreeKey });
      if (quick && placementFreeKey === current.placementFreeKey) return quick;
    }
    const p = await preparePlan(plan, dem ? { fileName: dem.fileName, data: dem.bytes } : undefined);
    const site: PreparedSite = { ...p.site, terrainId: siteTerrainId(p.site) };
    current = { key, placementFreeKey, site, warnings: p.warnings, grid: p.grid };
    prepared = current;
    return maskMode ? { ...site, maskMode } : site;
  };

  return {
    lastSite: () => prepared?.site ?? null,
    async evaluate(req: EvaluateRequest): Promise<CoverageView> {
      const t0 = now();
      const full = await prepare(req.plan, req.dem, req.maskMode);
      const site = req.maskMode === "fast" && req.focus ? focusSite(full, req.focus) : full;
      const result = await evaluateSite(site, { cache, mode: site.maskMode });
      const notes = [...new Set([...site.warnings, ...(prepared?.warnings ?? [])])];
      if (site.groundSource === "flat") notes.unshift("No DEM: the ground is flat.");
      const terrainKey = site.terrainId ?? siteTerrainId(site);
      const withTerrain = terrainKey !== req.haveTerrainKey;
      const view = cloneView(
        toCoverageView(site, result, {
          generation: req.generation,
          notes,
          elapsedMs: now() - t0,
          terrainKey,
          withTerrain,
          perRadarPostId: req.perRadarPostId ?? null,
        }),
      );
      if (site.maskMode !== "fast" || !req.focus) {
        const focused = view.slices.find(
          (s) => s.classId === req.focus?.classId && s.heightM === req.focus?.heightM,
        );
        if (focused) focused.gapShapes = gapShapesXY(focused.gap, view.frame);
      }
      return view;
    },
    async point(req: PointRequest): Promise<PointReply> {
      if (!(Number.isFinite(req.lonDeg) && Number.isFinite(req.latDeg)))
        throw new BadRequestError("point: lon/lat must be numbers");
      if (!(Number.isFinite(req.heightM) && req.heightM >= 0))
        throw new BadRequestError(`heightM: ${req.heightM} must be ≥ 0 m`);
      const site = await prepare(req.plan, req.dem);
      const grid = prepared?.grid;
      if (!grid) throw new BadRequestError("the site could not be prepared");
      const [x, y] = grid.toGrid(req.lonDeg, req.latDeg);
      const r = evaluatePoint(site, { x, y }, req.heightM);
      const radars: PointRadar[] = [];
      for (const row of r.rows) {
        if (row.targetId !== req.classId) continue;
        const placed = site.radars.find((p) => p.id === row.radarId) as PlacedRadar;
        const geo = azimuthAndDistanceXY(placed.x, placed.y, x, y);
        const budget = linkBudget(row.params, row.geometry.slantRangeM);
        radars.push({
          postId: row.radarId,
          postName: row.radarName,
          rangeM: row.geometry.slantRangeM,
          azimuthDeg: row.geometry.azimuthDeg ?? geo.azDeg,
          visible: row.visible,
          lowestVisibleAglM: row.lowestVisibleHeightAglM,
          diffractionLossDb: row.diffractionLossTwoWayDb,
          snrDb: row.snrDb,
          pd: row.pdTable,
          reason: row.reasonText,
          budget: budget.rows.map((b) => ({
            label: b.label,
            valueDb: b.valueDb,
            unit: b.unit,
            contributionDb: b.contributionDb,
            kind: b.kind,
          })),
          profile: terrainProfile(site, placed, { x, y }, req.heightM),
        });
      }
      return {
        generation: req.generation,
        lonDeg: req.lonDeg,
        latDeg: req.latDeg,
        heightM: req.heightM,
        classId: req.classId,
        combinedPd: r.combinedPd[req.classId] ?? Number.NaN,
        requiredPd: site.requirement.requiredPd,
        radars,
      };
    },
    async crashForTest() {
      setTimeout(() => {
        throw new Error("deliberate crash for a test");
      }, 0);
    },
  };
}
