/** Identity of the model: its name (editable) and id (fixed: posts refer to it). */
import { useId } from "react";
import { FieldErrors } from "./FormFields";
import { useRadarForm } from "./formContext";

export function IdentityGroup({ modelId }: { modelId: string }) {
  const id = useId();
  const { draft, errors, setText, commit } = useRadarForm();
  const bad = (errors.get("name")?.length ?? 0) > 0;
  return (
    <fieldset className="rf-group">
      <legend>Identity</legend>
      <div className="field rf-field">
        <label htmlFor={id}>Name</label>
        <input
          id={id}
          type="text"
          maxLength={200}
          value={draft.texts.name ?? ""}
          aria-invalid={bad ? true : undefined}
          aria-describedby={bad ? `${id}-err` : undefined}
          data-testid="rf-name"
          onChange={(e) => setText("name", e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => e.key === "Enter" && commit()}
        />
        <FieldErrors id={`${id}-err`} path="name" />
      </div>
      <p className="muted">
        Identifier <code>{modelId}</code> (posts refer to it; duplicate the model to make a new one)
      </p>
    </fieldset>
  );
}
