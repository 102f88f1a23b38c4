/** Target classes (RCS, Swerling case, speed, judged heights) and the detection requirement. */
import type { TargetClass } from "../../io/planSchema";
import { CheckField, NumberField, SelectField, TextField } from "../components/NumberField";
import { removeTargetClass, updateTargetClass } from "../planEdits";
import { freshId, usePlanStore } from "../store";

const SWERLING = [0, 1, 2, 3, 4].map((k) => ({
  value: String(k),
  label: `Swerling ${k}${k === 0 ? " (steady)" : ""}`,
}));

function ClassEditor({ t, heights, only }: { t: TargetClass; heights: number[]; only: boolean }) {
  const change = usePlanStore((s) => s.change);
  const edit = (patch: Partial<TargetClass>, label: string) =>
    change((p) => updateTargetClass(p, t.id, patch), label);
  return (
    <fieldset className="class-editor">
      <legend>{t.name}</legend>
      <TextField label="Name" value={t.name} onCommit={(name) => edit({ name }, "class name")} />
      <NumberField
        label="Mean RCS"
        unit="dBsm"
        min={-60}
        max={60}
        value={t.rcsDbsm}
        onCommit={(rcsDbsm) => edit({ rcsDbsm }, "RCS")}
        testId={`rcs-${t.id}`}
      />
      <SelectField
        label="Fluctuation"
        value={String(t.swerling)}
        options={SWERLING}
        onChange={(v) => edit({ swerling: Number(v) as TargetClass["swerling"] }, "Swerling case")}
      />
      <NumberField
        label="Speed"
        unit="m/s"
        min={0.1}
        max={1000}
        value={t.speedMPerS}
        onCommit={(speedMPerS) => edit({ speedMPerS }, "speed")}
      />
      <div className="field">
        <span>Judged at heights</span>
        <div className="check-row">
          {heights.map((h) => (
            <CheckField
              key={h}
              label={`${h} m AGL`}
              checked={t.heightsAglM.includes(h)}
              lockedBecause={
                t.heightsAglM.length === 1 && t.heightsAglM[0] === h
                  ? "A class is judged at one height at least: tick another first"
                  : undefined
              }
              onChange={(on) => {
                const next = on
                  ? [...t.heightsAglM, h].sort((a, b) => a - b)
                  : t.heightsAglM.filter((x) => x !== h);
                if (next.length > 0) edit({ heightsAglM: next }, "class heights");
              }}
            />
          ))}
        </div>
      </div>
      <button
        type="button"
        disabled={only}
        title={only ? "A plan judges at least one target class" : undefined}
        aria-label={`Delete ${t.name}`}
        data-testid={`delete-class-${t.id}`}
        onClick={() => change((p) => removeTargetClass(p, t.id), "delete target class")}
      >
        Delete class
      </button>
    </fieldset>
  );
}

export function TargetsPanel() {
  const plan = usePlanStore((s) => s.plan);
  const change = usePlanStore((s) => s.change);
  if (!plan) return null;
  const r = plan.requirement;
  return (
    <div className="panel" data-testid="targets-panel">
      <h3>Requirement</h3>
      <NumberField
        label="Required Pd"
        unit=""
        hint="(0–1)"
        min={0.01}
        max={0.999}
        value={r.requiredPd}
        onCommit={(requiredPd) =>
          change((p) => ({ ...p, requirement: { ...p.requirement, requiredPd } }), "required Pd")
        }
        testId="required-pd"
      />
      <NumberField
        label="Pfa"
        unit="per cell and look"
        min={1e-12}
        max={0.1}
        value={r.pfa}
        onCommit={(pfa) => change((p) => ({ ...p, requirement: { ...p.requirement, pfa } }), "Pfa")}
      />
      <NumberField
        label="Looks integrated"
        unit="looks"
        min={1}
        max={1000}
        step={1}
        value={r.looks}
        onCommit={(looks) =>
          change((p) => ({ ...p, requirement: { ...p.requirement, looks: Math.round(looks) } }), "looks")
        }
      />
      <h3>Target classes</h3>
      {plan.targetClasses.map((t) => (
        <ClassEditor
          key={t.id}
          t={t}
          heights={plan.analysis.targetHeightsM}
          only={plan.targetClasses.length <= 1}
        />
      ))}
      <button
        type="button"
        onClick={() =>
          change(
            (p) => ({
              ...p,
              targetClasses: [
                ...p.targetClasses,
                {
                  id: freshId("class", p.targetClasses),
                  name: "New class",
                  rcsDbsm: -10,
                  swerling: 1,
                  speedMPerS: 20,
                  heightsAglM: [...p.analysis.targetHeightsM],
                },
              ],
            }),
            "add target class",
          )
        }
      >
        Add target class
      </button>
    </div>
  );
}
