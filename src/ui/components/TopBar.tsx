/** The top bar: file actions, undo/redo, import, run status, about & safety. */
import { useEffect, useState } from "react";
import { useAssets } from "../assets";
import { type RecentPlan, recentPlans, recentPlanText, recentSettled } from "../autosave";
import { useCoverage } from "../coverageState";
import { demoSites } from "../demo";
import {
  loadOpened,
  openDemo,
  openPlanFromPicker,
  replacePlan,
  saveBundleToFile,
  savePlanToFile,
} from "../files";
import { newPlanAround } from "../newPlan";
import { formatLocalMinute } from "../numberText";
import { readPlanText } from "../planText";
import { say } from "../session";
import { historyLabels, redo, undo, useHistory, usePlanStore } from "../store";
import { ImportButton } from "./ImportButton";

/** A top-bar action that is greyed out while it cannot apply. */
function BarButton(p: {
  label: string;
  enabled: boolean;
  onClick: () => void;
  title?: string;
  testId: string;
}) {
  return (
    <button type="button" disabled={!p.enabled} onClick={p.onClick} title={p.title} data-testid={p.testId}>
      {p.label}
    </button>
  );
}

/** Values of the recent-plans list that open a demo site (recent entries start "recent:"). */
const DEMO_PREFIX = "demo:";
const DEMOS = demoSites();

export function TopBar(props: { onAbout: () => void; mapCentre: () => [number, number] }) {
  const plan = usePlanStore((s) => s.plan);
  const lastChange = usePlanStore((s) => s.lastChangeLabel);
  const undoLabel = useHistory((h) => historyLabels(h, lastChange).undo);
  const redoLabel = useHistory((h) => historyLabels(h, lastChange).redo);
  const canUndo = undoLabel !== null;
  const canRedo = redoLabel !== null;
  const running = useCoverage((s) => s.running);
  const progress = useCoverage((s) => s.progress);
  const elapsed = useCoverage((s) => s.view?.elapsedMs);
  const problem = useCoverage((s) => s.problem);
  const [recent, setRecent] = useState<RecentPlan[]>([]);
  // biome-ignore lint/correctness/useExhaustiveDependencies: reload the list when another plan is opened
  useEffect(() => {
    // After the writes the switch of plans asked for (the plan it replaced goes to the list).
    recentSettled()
      .then(recentPlans)
      .then(setRecent)
      .catch(() => setRecent([]));
  }, [plan?.site.name]);

  const openRecent = async (key: string) => {
    const text = await recentPlanText(key);
    if (!text) return say("warning", "That recent plan is no longer stored.");
    const r = readPlanText(text, "the recent plan");
    if (!r.ok) return say("error", r.message, r.details);
    await loadOpened({ ok: true, plan: r.plan, dem: null }, r.plan.site.name);
  };

  return (
    <header className="topbar">
      <div className="brand" title="Picket radar coverage planner">
        <span className="brand-mark" aria-hidden="true" />
        Picket
      </div>
      <div className="site-name" data-testid="site-name">
        {plan?.site.name ?? "…"}
      </div>
      <nav className="actions" aria-label="Plan">
        <button
          type="button"
          onClick={() => {
            const [lon, lat] = props.mapCentre();
            replacePlan(newPlanAround(lon, lat, plan?.radarModels ?? []));
            useAssets.getState().setDem(null);
            say("info", "New plan: draw the protected area and place posts.");
          }}
        >
          New
        </button>
        <button type="button" onClick={() => void openPlanFromPicker()} data-testid="open-plan">
          Open…
        </button>
        <BarButton
          label="Save plan"
          enabled={!!plan}
          onClick={() => plan && void savePlanToFile(plan)}
          testId="save-plan"
        />
        <BarButton
          label="Save with DEM"
          enabled={!!plan}
          onClick={() => plan && void saveBundleToFile(plan, useAssets.getState().dem)}
          testId="save-bundle"
        />
        <select
          aria-label="Recent plans and demo sites"
          className="recent-select"
          value=""
          onChange={(e) => {
            const v = e.target.value;
            if (v.startsWith(DEMO_PREFIX)) void openDemo(v.slice(DEMO_PREFIX.length));
            else if (v) void openRecent(v);
          }}
          data-testid="recent-plans"
        >
          <option value="">Recent…</option>
          {recent.length > 0 && (
            <optgroup label="Recent plans">
              {recent.map((r) => (
                <option key={r.key} value={r.key}>
                  {r.name} ({formatLocalMinute(new Date(r.savedAtIso))})
                </option>
              ))}
            </optgroup>
          )}
          <optgroup label="Demo sites">
            {DEMOS.map((d) => (
              <option key={d.id} value={DEMO_PREFIX + d.id}>
                {d.name}
              </option>
            ))}
          </optgroup>
        </select>
        <ImportButton />
        <span className="sep" />
        <BarButton
          label="Undo"
          enabled={canUndo}
          onClick={() => undo()}
          title={undoLabel ? `Undo ${undoLabel} (Ctrl+Z)` : "Nothing to undo"}
          testId="undo"
        />
        <BarButton
          label="Redo"
          enabled={canRedo}
          onClick={() => redo()}
          title={redoLabel ? `Redo ${redoLabel} (Ctrl+Shift+Z)` : "Nothing to redo"}
          testId="redo"
        />
      </nav>
      <div
        className="run-status"
        role="status"
        data-testid="run-status"
        title={problem ? `Not computed: ${problem}` : undefined}
      >
        {running && progress !== null && (
          <progress className="run-progress" max={1} value={progress} aria-label="Run progress" />
        )}
        {running
          ? progress !== null
            ? `Computing… ${Math.floor(progress * 100)} %`
            : "Computing…"
          : problem
            ? `Not computed: ${problem}`
            : elapsed !== undefined
              ? `Computed in ${Math.round(elapsed)} ms`
              : ""}
      </div>
      <button type="button" className="about-button" onClick={props.onAbout} data-testid="about">
        About & safety
      </button>
    </header>
  );
}
