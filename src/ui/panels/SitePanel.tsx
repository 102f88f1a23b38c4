/** Site: name, approach ring depth, protected areas, drawing tools for areas, holes, buildings, trees. */
import { useMemo, useState } from "react";
import type { ProtectedArea } from "../../io/planSchema";
import { areaGeometryProblem } from "../../io/polygonRules";
import { NumberField, TextField } from "../components/NumberField";
import { removeProtectedArea } from "../planEdits";
import { type Tool, useSession } from "../session";
import { usePlanStore } from "../store";
import { ObstructionEditor } from "./ObstructionEditor";

const DRAW_TOOLS: { tool: Tool; label: string; hint: string }[] = [
  {
    tool: "area",
    label: "Draw protected area",
    hint: "Click corners on the map; click the first corner to close.",
  },
  { tool: "hole", label: "Cut a hole", hint: "Draw a polygon inside a protected area to leave it out." },
  {
    tool: "building",
    label: "Draw building",
    hint: "Click the corners of a footprint; it gets the height below.",
  },
  {
    tool: "tree",
    label: "Draw tree stand",
    hint: "Click the corners of a stand; it gets the canopy height below.",
  },
];

export function SitePanel() {
  const plan = usePlanStore((s) => s.plan);
  const change = usePlanStore((s) => s.change);
  const tool = useSession((s) => s.tool);
  const setSession = useSession((s) => s.set);
  const buildingHeightM = useSession((s) => s.newBuildingHeightM);
  const canopyHeightM = useSession((s) => s.newCanopyHeightM);
  const [, force] = useState(0);
  if (!plan) return null;
  const g = plan.terrain.ground;
  return (
    <div className="panel" data-testid="site-panel">
      <TextField
        label="Site name"
        value={plan.site.name}
        onCommit={(name) => change((p) => ({ ...p, site: { ...p.site, name } }), "site name")}
      />
      <NumberField
        label="Approach ring depth"
        unit="m"
        min={0}
        max={50000}
        value={plan.approachRingDepthM}
        testId="ring-depth"
        onCommit={(v) => change((p) => ({ ...p, approachRingDepthM: v }), "approach ring")}
      />
      <h3>Protected areas</h3>
      <ul className="plain-list" data-testid="area-list">
        {plan.protectedAreas.map((a) => (
          <li key={a.id}>
            <span>{a.name}</span>
            <span className="muted">
              {a.geometry.type === "Polygon" ? `${a.geometry.coordinates.length - 1} hole(s)` : "multi-part"}
            </span>
            <AreaProblem area={a} />
            <button
              type="button"
              disabled={plan.protectedAreas.length <= 1}
              aria-label={`Delete ${a.name}`}
              onClick={() => change((p) => removeProtectedArea(p, a.id), "delete area")}
            >
              Delete
            </button>
          </li>
        ))}
      </ul>
      <h3>Draw</h3>
      <fieldset className="tool-grid" aria-label="Drawing tools">
        {DRAW_TOOLS.map((t) => (
          <button
            key={t.tool}
            type="button"
            aria-pressed={tool === t.tool}
            title={t.hint}
            data-testid={`tool-${t.tool}`}
            onClick={() => {
              setSession({ tool: tool === t.tool ? "select" : t.tool });
              force((n) => n + 1);
            }}
          >
            {t.label}
          </button>
        ))}
      </fieldset>
      {DRAW_TOOLS.find((t) => t.tool === tool) && (
        <p className="muted">{DRAW_TOOLS.find((t) => t.tool === tool)?.hint}</p>
      )}
      <NumberField
        label="Height of new buildings"
        unit="m AGL"
        min={0.5}
        max={1000}
        value={buildingHeightM}
        onCommit={(v) => setSession({ newBuildingHeightM: v })}
      />
      <NumberField
        label="Canopy height of new tree stands"
        unit="m AGL"
        min={0.5}
        max={150}
        value={canopyHeightM}
        onCommit={(v) => setSession({ newCanopyHeightM: v })}
      />
      <h3>Terrain</h3>
      <p data-testid="terrain-summary">
        {g.type === "dem"
          ? `DEM ${g.file} (${g.kind}, ${g.surface})`
          : `Flat ground at ${g.elevationAmslM} m above sea level`}
        {" · "}
        {plan.terrain.buildings.features.length} buildings · {plan.terrain.treeStands.length} tree stands
      </p>
      <p className="muted">
        Import a DEM, buildings (GeoJSON, KML, OSM) or posts (CSV) with Import… or drop files on the map.
        Click a building or tree stand on the map to change its height or delete it.
      </p>
      <ObstructionEditor />
    </div>
  );
}

/** What keeps an area from being evaluated (a ring that crosses itself, …), shown beside it. */
function AreaProblem({ area }: { area: ProtectedArea }) {
  const problem = useMemo(() => areaGeometryProblem(area.geometry), [area.geometry]);
  if (!problem) return null;
  return (
    <span className="field-error" role="alert" data-testid="area-problem">
      Not evaluated: {problem}. Undo, or delete the area and draw it again.
    </span>
  );
}
