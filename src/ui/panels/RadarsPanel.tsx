/**
 * The radar-model library: the plan's models with their key figures and the posts that use them; a
 * new model from starting figures, duplicate, edit (in the form of radarForm/, with the JSON document
 * as its advanced view), export, import a model file, delete an unused model.
 */
import { fileOpen, fileSave } from "browser-fs-access";
import { useCallback, useRef, useState } from "react";
import { radarRangeWindowM } from "../../coverage/coverage";
import type { RadarModel } from "../../coverage/radarModel";
import { loadRadarModelFile } from "../../io/radarFile";
import { importedRadarModel, newRadarModel } from "../newRadarModel";
import { say } from "../session";
import { freshId, usePlanStore } from "../store";
import { RadarModelForm } from "./radarForm/RadarModelForm";

const HZ_PER_GHZ = 1e9;
const M_PER_KM = 1000;

function KeyFigures({ m }: { m: RadarModel }) {
  const win = radarRangeWindowM(m);
  return (
    <dl className="figures">
      <dt>Frequency</dt>
      <dd>{(m.frequencyHz / HZ_PER_GHZ).toFixed(2)} GHz</dd>
      <dt>Peak power</dt>
      <dd>{m.transmitter.peakPowerW} W</dd>
      <dt>Peak gain</dt>
      <dd>{m.txAntenna.peakGainDbi} dBi</dd>
      <dt>Beamwidth az × el</dt>
      <dd>
        {m.txAntenna.azBeamwidthDeg}° × {m.txAntenna.elBeamwidthDeg}°
      </dd>
      <dt>Scan</dt>
      <dd>
        {m.scan.kind === "sector"
          ? `sector ${m.scan.sectorWidthDeg}°`
          : m.scan.kind === "staring"
            ? `staring ${m.scan.fovAzDeg}°`
            : "rotating 360°"}
      </dd>
      <dt>Instrumented range</dt>
      <dd>
        {(win.minM / M_PER_KM).toFixed(2)}–{(win.maxM / M_PER_KM).toFixed(1)} km
        {win.minM > m.blindZoneM ? " (near edge set by the transmitted pulse, c·τ/2)" : ""}
      </dd>
      <dt>Waveform</dt>
      <dd>{m.waveform.kind === "fmcw" ? "FMCW" : "pulsed"}</dd>
    </dl>
  );
}

export function RadarsPanel() {
  const plan = usePlanStore((s) => s.plan);
  const change = usePlanStore((s) => s.change);
  const [selected, setSelected] = useState<string | null>(null);
  const editButton = useRef<HTMLButtonElement>(null);
  const [editing, setEditing] = useState(false);
  /** Set once the form was opened: it stays mounted (hidden) so that closing it keeps the typing. */
  const [formMounted, setFormMounted] = useState(false);
  const model = plan?.radarModels.find((m) => m.id === selected) ?? plan?.radarModels[0];
  const modelId = model?.id;
  const apply = useCallback(
    (next: RadarModel) =>
      change(
        (p) => ({ ...p, radarModels: p.radarModels.map((m) => (m.id === modelId ? next : m)) }),
        "edit radar model",
      ),
    [change, modelId],
  );
  if (!plan) return null;
  /** Names of the posts that use the shown model (it cannot be deleted while there are any). */
  const users = model ? plan.posts.filter((p) => p.radarModelId === model.id).map((p) => p.name) : [];

  const addNew = () => {
    const m = newRadarModel(plan.radarModels);
    change((p) => ({ ...p, radarModels: [...p.radarModels, m] }), "add radar model");
    setSelected(m.id);
    setFormMounted(true);
    setEditing(true);
  };

  const duplicate = (m: RadarModel) => {
    const id = freshId(m.id, plan.radarModels);
    const copy: RadarModel = { ...structuredClone(m), id, name: `${m.name} (copy)`, invented: m.invented };
    change((p) => ({ ...p, radarModels: [...p.radarModels, copy] }), "duplicate radar model");
    setSelected(id);
  };
  const importModel = async () => {
    let file: File;
    try {
      file = await fileOpen({ extensions: [".json"], description: "Radar model" });
    } catch {
      return;
    }
    const r = loadRadarModelFile(await file.text());
    if (!r.ok)
      return say(
        "error",
        `${file.name} is not a valid radar model; nothing was added.`,
        r.errors.map((e) => `${e.path}: ${e.message}`),
      );
    const m = importedRadarModel(plan.radarModels, r.model);
    change((p) => ({ ...p, radarModels: [...p.radarModels, m] }), "import radar model");
    setSelected(m.id);
  };
  return (
    <div className="panel" data-testid="radars-panel">
      <ul className="plain-list">
        {plan.radarModels.map((m) => (
          <li key={m.id} className={m.id === model?.id ? "selected" : undefined}>
            <button type="button" className="link" onClick={() => setSelected(m.id)}>
              {m.name}
            </button>
          </li>
        ))}
      </ul>
      <div className="button-row">
        <button type="button" onClick={addNew}>
          New model
        </button>
        <button type="button" onClick={() => void importModel()}>
          Import model file…
        </button>
      </div>
      {model && (
        <section aria-label="Selected radar model">
          <h3>{model.name}</h3>
          {model.invented && <p className="muted">An invented example model, not a real product.</p>}
          <KeyFigures m={model} />
          <p className="muted" data-testid="model-users">
            {users.length === 0 ? "No post uses this model." : `Used by ${users.join(", ")}.`}
          </p>
          {(editing || formMounted) && (
            <RadarModelForm
              key={model.id}
              model={model}
              requirement={plan.requirement}
              onApply={apply}
              hidden={!editing}
              onClose={() => {
                setEditing(false);
                editButton.current?.focus();
              }}
            />
          )}
          {
            <div className="button-row">
              <button
                type="button"
                ref={editButton}
                aria-pressed={editing}
                onClick={() => {
                  setFormMounted(true);
                  setEditing(!editing);
                }}
              >
                Edit
              </button>
              <button type="button" onClick={() => duplicate(model)}>
                Duplicate
              </button>
              <button
                type="button"
                onClick={() =>
                  void fileSave(new Blob([JSON.stringify(model, null, 2)], { type: "application/json" }), {
                    fileName: `${model.id}.json`,
                  }).catch(() => undefined)
                }
              >
                Export
              </button>
              <button
                type="button"
                className="danger"
                disabled={users.length > 0}
                title={users.length > 0 ? "A post uses this model" : undefined}
                onClick={() =>
                  change(
                    (p) => ({ ...p, radarModels: p.radarModels.filter((m) => m.id !== model.id) }),
                    "delete radar model",
                  )
                }
              >
                Delete
              </button>
            </div>
          }
        </section>
      )}
    </div>
  );
}
