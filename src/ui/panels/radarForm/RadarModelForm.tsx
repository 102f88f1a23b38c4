/**
 * The radar-model form: grouped, labelled inputs in display units, errors beside their fields, derived
 * figures beside the form, and the JSON document as an advanced view. A change is applied (through
 * `onApply`, one undo step) only when the whole model validates; otherwise the typed text stays in the
 * form with its errors. When the model changes from outside (undo, redo), the form shows it afresh.
 */
import { useEffect, useMemo, useRef, useState } from "react";
import type { RadarModel } from "../../../coverage/radarModel";
import type { Requirement } from "../../../io/planSchema";
import { parseRadarModel } from "../../../io/radarSchema";
import type { FieldError } from "../../../io/schemaFields";
import { RxAntennaGroup, TxAntennaGroup } from "./AntennaGroup";
import { DerivedPanel } from "./DerivedPanel";
import { type RadarFormApi, RadarFormContext } from "./formContext";
import { candidateFromDraft, draftFromModel, mergeErrors, type RadarDraft, routeErrors } from "./formModel";
import { IdentityGroup } from "./IdentityGroup";
import { JsonEditor } from "./JsonEditor";
import { RangesGroup } from "./RangesGroup";
import { ScanGroup } from "./ScanGroup";
import { TxRxGroup } from "./TxRxGroup";
import { WaveformGroup } from "./WaveformGroup";
import "./radarForm.css";

export interface RadarModelFormProps {
  model: RadarModel;
  requirement: Requirement;
  /** Replaces the model in the plan (one undo step). */
  onApply: (model: RadarModel) => void;
  onClose?: () => void;
  /** Hidden but kept (with its typing) while closed. */
  hidden?: boolean;
}

/** Validates a draft against parseRadarModel: the model, or the errors with their paths. */
export function checkDraft(
  base: RadarModel,
  d: RadarDraft,
): { ok: true; model: RadarModel } | { ok: false; errors: FieldError[] } {
  const { json, textErrors } = candidateFromDraft(base, d);
  const r = parseRadarModel(json);
  if (r.ok && textErrors.length === 0) return r;
  return { ok: false, errors: mergeErrors(textErrors, r.ok ? [] : r.errors) };
}

export function RadarModelForm({ model, requirement, onApply, onClose, hidden }: RadarModelFormProps) {
  const [draft, setDraft] = useState(() => draftFromModel(model));
  const [errors, setErrors] = useState<FieldError[]>([]);
  const [json, setJson] = useState(false);
  const draftRef = useRef(draft);
  const sheet = useRef<HTMLElement>(null);
  // Keyboard users land in the form when it opens (its first field, the name).
  useEffect(() => {
    if (!hidden) sheet.current?.querySelector<HTMLElement>(".rf-groups input, textarea")?.focus();
  }, [hidden]);
  const appliedRef = useRef(model);
  useEffect(() => {
    if (model === appliedRef.current) return;
    appliedRef.current = model;
    const d = draftFromModel(model);
    draftRef.current = d;
    setDraft(d);
    setErrors([]);
  }, [model]);

  const api = useMemo<RadarFormApi>(() => {
    const update = (fn: (d: RadarDraft) => RadarDraft) => {
      draftRef.current = fn(draftRef.current);
      setDraft(draftRef.current);
    };
    const commit = () => {
      const r = checkDraft(appliedRef.current, draftRef.current);
      if (!r.ok) return setErrors(r.errors);
      setErrors([]);
      if (JSON.stringify(r.model) === JSON.stringify(appliedRef.current)) return;
      appliedRef.current = r.model;
      onApply(r.model);
    };
    return {
      draft,
      errors: new Map(),
      setText: (path, text) => update((d) => ({ ...d, texts: { ...d.texts, [path]: text } })),
      commit,
      choose: (path, value) => {
        update((d) => ({ ...d, texts: { ...d.texts, [path]: value } }));
        commit();
      },
      setRxSame: (rxSame) => {
        update((d) => ({ ...d, rxSame }));
        commit();
      },
      setCut: (path, cut) => {
        update((d) => {
          const cuts = { ...d.cuts };
          if (cut) cuts[path] = cut;
          else delete cuts[path];
          return { ...d, cuts };
        });
        commit();
      },
    };
  }, [draft, onApply]);

  const routed = routeErrors(errors);
  const value = { ...api, errors: routed.byPath };
  return (
    <section
      ref={sheet}
      className="rf-sheet"
      hidden={hidden}
      aria-label={`Edit radar model ${model.name}`}
      data-testid="radar-form"
      onKeyDown={(e) => {
        if (e.key === "Escape" && onClose) onClose();
      }}
    >
      <header className="rf-head">
        <h3>Edit {model.name}</h3>
        <label className="rf-toggle">
          <input type="checkbox" checked={json} onChange={(e) => setJson(e.target.checked)} /> Advanced (JSON)
        </label>
        {onClose && (
          <button type="button" onClick={onClose} title="Close (Esc); typing not yet applied is kept">
            Close
          </button>
        )}
      </header>
      <p className="muted">
        Each change is applied when the whole model is valid (one undo step); until then it stays here with
        its errors.
      </p>
      {routed.other.length > 0 && (
        <ul className="field-error" data-testid="rf-other-errors">
          {routed.other.map((e) => (
            <li key={`${e.path}:${e.message}`}>
              {e.path}: {e.message}
            </li>
          ))}
        </ul>
      )}
      <div className="rf-body">
        {json ? (
          <JsonEditor model={model} onApply={onApply} />
        ) : (
          <RadarFormContext.Provider value={value}>
            <div className="rf-groups">
              <IdentityGroup modelId={model.id} />
              <TxRxGroup />
              <WaveformGroup />
              <TxAntennaGroup />
              <RxAntennaGroup />
              <ScanGroup />
              <RangesGroup />
            </div>
          </RadarFormContext.Provider>
        )}
        <DerivedPanel model={model} requirement={requirement} />
      </div>
    </section>
  );
}
