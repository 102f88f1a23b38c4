/** The model as a JSON document checked field by field (the form's "Advanced (JSON)" view). */
import { useEffect, useId, useState } from "react";
import type { RadarModel } from "../../../coverage/radarModel";
import { loadRadarModelFile } from "../../../io/radarFile";

export function JsonEditor({ model, onApply }: { model: RadarModel; onApply: (m: RadarModel) => void }) {
  const id = useId();
  const [text, setText] = useState(JSON.stringify(model, null, 2));
  const [errors, setErrors] = useState<string[]>([]);
  useEffect(() => setText(JSON.stringify(model, null, 2)), [model]);
  const apply = () => {
    const r = loadRadarModelFile(text);
    if (!r.ok) return setErrors(r.errors.map((e) => `${e.path}: ${e.message}`));
    if (r.model.id !== model.id)
      return setErrors([`id: keep "${model.id}" (posts refer to it); duplicate to make a new model`]);
    setErrors([]);
    onApply(r.model);
  };
  return (
    <div className="model-editor">
      <label htmlFor={id}>Model document (JSON, SI units in the field names)</label>
      <textarea id={id} value={text} rows={24} spellCheck={false} onChange={(e) => setText(e.target.value)} />
      {errors.length > 0 && (
        <ul className="field-error" role="alert">
          {errors.map((e) => (
            <li key={e}>{e}</li>
          ))}
        </ul>
      )}
      <div className="button-row">
        <button type="button" onClick={apply}>
          Apply
        </button>
        <button type="button" onClick={() => setText(JSON.stringify(model, null, 2))}>
          Revert
        </button>
      </div>
    </div>
  );
}
