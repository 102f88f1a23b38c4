/**
 * Analysis settings: cell size, effective-Earth factor, target heights, masking mode; the grid size and
 * the memory a run needs are shown before the run, and a run that would not fit is refused.
 */
import { useEffect, useId, useMemo, useState } from "react";
import { errorText } from "../../io/importErrors";
import { MAX_TARGET_HEIGHT_M } from "../../io/planSchema";
import {
  cellSizeToFitM,
  checkRunMemory,
  estimateRunMemoryBytes,
  RUN_MEMORY_BUDGET_BYTES,
  runSizeOf,
  siteGridFrame,
} from "../../io/siteGrid";
import { NumberField, SelectField } from "../components/NumberField";
import { formatMemory, parseTypedNumber } from "../numberText";
import { heightSet, setAnalysisHeights } from "../planEdits";
import { usePlanStore } from "../store";

/**
 * Heights typed as a list, m: separated by commas or semicolons (a space inside one is an error, so
 * "20 000" is not read as 20 and 0), each a number (parseTypedNumber) from 0 to MAX_TARGET_HEIGHT_M.
 */
function parseHeightsList(text: string): { ok: true; heights: number[] } | { ok: false; reason: string } {
  const parts = text
    .split(/[,;]/)
    .map((t) => t.trim())
    .filter((t) => t !== "");
  if (parts.length === 0) return { ok: false, reason: "give at least one height, m, separated by commas" };
  const heights: number[] = [];
  for (const part of parts) {
    const typed = parseTypedNumber(part);
    const v = typed.ok ? typed.value : Number.NaN;
    if (!(v >= 0 && v <= MAX_TARGET_HEIGHT_M)) {
      return {
        ok: false,
        reason: `"${part}" must be a number from 0 to ${MAX_TARGET_HEIGHT_M} m (separate heights with commas)`,
      };
    }
    heights.push(v);
  }
  return { ok: true, heights };
}

function HeightsField({ heights, onCommit }: { heights: number[]; onCommit: (h: number[]) => void }) {
  const id = useId();
  const shown = heights.join(", ");
  const [text, setText] = useState(shown);
  const [error, setError] = useState<string | null>(null);
  // After an undo, a redo or another change of the plan, the field shows the plan's heights.
  useEffect(() => {
    setText(shown);
    setError(null);
  }, [shown]);
  const commit = () => {
    const r = parseHeightsList(text);
    if (!r.ok) return setError(`Target heights: ${r.reason}`);
    setError(null);
    // The same heights again (a blur after Enter, focus passing through) are no change, no undo step.
    if (heightSet(r.heights).join(",") !== heightSet(heights).join(",")) onCommit(r.heights);
  };
  return (
    <div className="field">
      <label htmlFor={id}>Target heights</label>
      <span className="field-input">
        <input
          id={id}
          value={text}
          onChange={(e) => setText(e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => e.key === "Enter" && commit()}
          data-testid="analysis-heights"
        />
        <span className="unit">m AGL</span>
      </span>
      {error && (
        <span className="field-error" role="alert">
          {error}
        </span>
      )}
    </div>
  );
}

export function AnalysisPanel() {
  const plan = usePlanStore((s) => s.plan);
  const change = usePlanStore((s) => s.change);
  const estimate = useMemo(() => {
    if (!plan) return null;
    try {
      const g = siteGridFrame(plan);
      const size = runSizeOf(plan, g);
      const check = checkRunMemory(size);
      // Beside a refusal, the cell size that would fit (searched only then).
      const fit = check.ok ? null : cellSizeToFitM(plan);
      return { g, size, bytes: estimateRunMemoryBytes(size), check, fit, error: null };
    } catch (e) {
      return {
        g: null,
        size: null,
        bytes: 0,
        check: null,
        fit: null,
        error: errorText(e),
      };
    }
  }, [plan]);
  const fit = estimate?.fit ?? null;
  if (!plan) return null;
  const a = plan.analysis;
  return (
    <div className="panel" data-testid="analysis-panel">
      <SelectField
        label="Cell size"
        value={a.cellSizeM === "auto" ? "auto" : "fixed"}
        options={[
          { value: "auto", label: "Automatic (caps the cell count)" },
          { value: "fixed", label: "Fixed" },
        ]}
        onChange={(v) =>
          change(
            (p) => ({
              ...p,
              analysis: {
                ...p.analysis,
                cellSizeM: v === "auto" ? "auto" : estimate?.g ? estimate.g.frame.cellSizeM : 10,
              },
            }),
            "cell size",
          )
        }
      />
      {a.cellSizeM !== "auto" && (
        <NumberField
          label="Cell side"
          unit="m"
          min={0.5}
          max={1000}
          value={a.cellSizeM}
          onCommit={(v) => change((p) => ({ ...p, analysis: { ...p.analysis, cellSizeM: v } }), "cell size")}
          testId="cell-size"
        />
      )}
      <NumberField
        label="Effective Earth factor k"
        unit=""
        hint="(4/3 standard, 1 geometric)"
        min={0.5}
        max={1000}
        digits={3}
        value={a.effectiveEarthFactor}
        onCommit={(k) =>
          change((p) => ({ ...p, analysis: { ...p.analysis, effectiveEarthFactor: k } }), "k factor")
        }
      />
      <HeightsField
        heights={a.targetHeightsM}
        onCommit={(h) => change((p) => setAnalysisHeights(p, h), "target heights")}
      />
      <SelectField
        label="Masking"
        value={a.maskMode}
        options={[
          { value: "accurate", label: "Accurate (for reports)" },
          { value: "fast", label: "Fast (quick look)" },
        ]}
        onChange={(maskMode) =>
          change((p) => ({ ...p, analysis: { ...p.analysis, maskMode } }), "masking mode")
        }
      />
      <h3>Run size</h3>
      {estimate?.error ? (
        <p className="field-error" role="alert">
          {estimate.error}
        </p>
      ) : estimate?.g && estimate.size ? (
        <dl className="figures" data-testid="run-estimate">
          <dt>Grid</dt>
          <dd>
            {estimate.g.frame.width} × {estimate.g.frame.height} cells of {estimate.g.frame.cellSizeM} m
          </dd>
          <dt>Cells</dt>
          <dd>{(estimate.g.cellCount / 1e6).toFixed(2)} million</dd>
          <dt>Radars × heights</dt>
          <dd>
            {estimate.size.radars} × {estimate.size.heights}
          </dd>
          <dt>Maps (class at a height)</dt>
          <dd data-testid="run-slices">{estimate.size.slices}</dd>
          <dt>Memory needed</dt>
          <dd data-testid="run-memory">
            {formatMemory(estimate.bytes)} of {formatMemory(RUN_MEMORY_BUDGET_BYTES)}
          </dd>
          <dt>Frame</dt>
          <dd>
            UTM zone {estimate.g.zone.zone}
            {estimate.g.zone.south ? "S" : "N"} (EPSG:{estimate.g.epsg})
          </dd>
        </dl>
      ) : null}
      {estimate?.check && !estimate.check.ok && (
        <>
          <p className="field-error" role="alert">
            {estimate.check.message}
          </p>
          {fit !== null && fit !== a.cellSizeM && (
            <button
              type="button"
              data-testid="cell-size-to-fit"
              onClick={() =>
                change(
                  (p) => ({ ...p, analysis: { ...p.analysis, cellSizeM: fit } }),
                  "cell size to fit memory",
                )
              }
            >
              Use {fit} m cells (the smallest that fit)
            </button>
          )}
        </>
      )}
    </div>
  );
}
