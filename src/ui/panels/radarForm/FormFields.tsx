/**
 * Inputs of the radar-model form: a number with its unit, a choice, and the errors that
 * parseRadarModel names for the field's path, shown beside it and tied to it by aria-describedby.
 */
import { useId } from "react";
import { useRadarForm } from "./formContext";
import type { NumberSpec } from "./formModel";

export function FieldErrors({ id, path }: { id: string; path: string }) {
  const { errors } = useRadarForm();
  const list = errors.get(path);
  if (!list || list.length === 0) return null;
  return (
    <span className="field-error" id={id} data-testid={`rf-error-${path}`}>
      {list.join("; ")}
    </span>
  );
}

export function NumberInput({ spec }: { spec: NumberSpec }) {
  const id = useId();
  const { draft, errors, setText, commit } = useRadarForm();
  const bad = (errors.get(spec.path)?.length ?? 0) > 0;
  return (
    <div className="field rf-field">
      <label htmlFor={id}>
        {spec.label}
        {spec.hint && <span className="rf-hint"> ({spec.hint})</span>}
      </label>
      <span className="field-input">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          value={draft.texts[spec.path] ?? ""}
          aria-invalid={bad ? true : undefined}
          aria-describedby={bad ? `${id}-err` : undefined}
          data-testid={`rf-${spec.path}`}
          onChange={(e) => setText(spec.path, e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => e.key === "Enter" && commit()}
        />
        <span className="unit rf-unit">{spec.unit.symbol}</span>
      </span>
      <FieldErrors id={`${id}-err`} path={spec.path} />
    </div>
  );
}

export function ChoiceInput(p: {
  path: string;
  label: string;
  options: ReadonlyArray<{ value: string; label: string }>;
}) {
  const id = useId();
  const { draft, errors, choose } = useRadarForm();
  const bad = (errors.get(p.path)?.length ?? 0) > 0;
  return (
    <div className="field rf-field">
      <label htmlFor={id}>{p.label}</label>
      <select
        id={id}
        value={draft.texts[p.path] ?? ""}
        aria-describedby={bad ? `${id}-err` : undefined}
        data-testid={`rf-${p.path}`}
        onChange={(e) => choose(p.path, e.target.value)}
      >
        {p.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <FieldErrors id={`${id}-err`} path={p.path} />
    </div>
  );
}
