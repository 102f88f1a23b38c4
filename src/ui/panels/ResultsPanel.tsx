/** What is shown: layer, target class, height (switches at once: all heights are computed together). */
import { useMemo } from "react";
import { Legend } from "../components/Legend";
import { CheckField, SelectField } from "../components/NumberField";
import { shownView, useCoverage } from "../coverageState";
import { selectedSlice } from "../selection";
import { type LayerKind, useSession } from "../session";
import { usePlanStore } from "../store";
import { SummaryPanel } from "./SummaryPanel";

const LAYERS: { value: LayerKind; label: string }[] = [
  { value: "combined", label: "Combined Pd" },
  { value: "single", label: "One radar's Pd" },
  { value: "overlap", label: "Overlap (radars meeting Pd)" },
  { value: "lowest", label: "Lowest visible height" },
];

/** Overlays switched on and off beside the map layer. */
const OVERLAYS: {
  key: "showGaps" | "showSectors" | "showExposure" | "showBuildings";
  label: string;
  testId?: string;
}[] = [
  { key: "showGaps", label: "Gaps", testId: "show-gaps" },
  { key: "showSectors", label: "Sectors and max range" },
  { key: "showExposure", label: "RF-exposure distance", testId: "show-exposure" },
  { key: "showBuildings", label: "Buildings and trees" },
];

export function ResultsPanel() {
  const plan = usePlanStore((s) => s.plan);
  const view = useCoverage(shownView);
  const s = useSession();
  const slice = selectedSlice(view, s.classId, s.heightM);
  const classHeights = useMemo(
    () => (view && slice ? view.slices.filter((x) => x.classId === slice.classId).map((x) => x.heightM) : []),
    [view, slice],
  );
  if (!plan) return null;
  return (
    <div className="panel" data-testid="results-panel">
      <fieldset className="layer-choice">
        <legend>Map layer</legend>
        {LAYERS.map((l) => (
          <label key={l.value} className="radio">
            <input
              type="radio"
              name="layer"
              value={l.value}
              checked={s.layer === l.value}
              onChange={() => s.set({ layer: l.value })}
              data-testid={`layer-${l.value}`}
            />
            {l.label}
          </label>
        ))}
      </fieldset>
      {s.layer === "single" && (
        <SelectField
          label="Radar"
          value={s.singlePostId ?? view?.radarPostIds[0] ?? ""}
          options={(view?.radarPostIds ?? []).map((id) => ({
            value: id,
            label: plan.posts.find((p) => p.id === id)?.name ?? id,
          }))}
          onChange={(v) => s.set({ singlePostId: v })}
        />
      )}
      <SelectField
        label="Target class"
        value={slice?.classId ?? plan.targetClasses[0].id}
        options={plan.targetClasses.map((t) => ({ value: t.id, label: `${t.name} (${t.rcsDbsm} dBsm)` }))}
        onChange={(v) => s.set({ classId: v })}
        testId="class-select"
      />
      <div className="field">
        <span id="height-label">Target height</span>
        <div className="height-buttons">
          {classHeights.map((h) => (
            <button
              key={h}
              type="button"
              aria-pressed={slice?.heightM === h}
              data-testid={`height-${h}`}
              onClick={() => s.set({ heightM: h })}
            >
              {h} m AGL
            </button>
          ))}
        </div>
      </div>
      <div className="check-row">
        {OVERLAYS.map((o) => (
          <CheckField
            key={o.key}
            label={o.label}
            checked={s[o.key]}
            onChange={(v) => s.set({ [o.key]: v })}
            testId={o.testId}
          />
        ))}
      </div>
      <Legend
        kind={s.layer}
        maxOverlap={view?.radarPostIds.length ?? 1}
        maxHeightM={Math.max(...(view?.heightsM ?? [1]), 1) * 2}
        showGaps={s.showGaps}
        showSectors={s.showSectors}
        showExposure={s.showExposure}
      />
      {view?.notes.length ? (
        <ul className="notes" data-testid="run-notes">
          {view.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      ) : null}
      <SummaryPanel />
    </div>
  );
}
