/**
 * One antenna plane's measured pattern cut: what is in use, "Import pattern cut (CSV)…" through
 * parsePatternCsv, and "Use analytic shape". A file that fails keeps the cut in use and lists its errors.
 */
import { fileOpen } from "browser-fs-access";
import { useId, useState } from "react";
import { parsePatternCsv } from "../../../io/patternCsv";
import { FieldErrors } from "./FormFields";
import { useRadarForm } from "./formContext";
import type { CutPath } from "./formModel";

interface ImportNote {
  kind: "error" | "warning";
  lines: string[];
}

export function PatternCutRow({ path, plane }: { path: CutPath; plane: "azimuth" | "elevation" }) {
  const id = useId();
  const { draft, setCut } = useRadarForm();
  const [note, setNote] = useState<ImportNote | null>(null);
  const cut = draft.cuts[path];
  const pick = async () => {
    let file: File;
    try {
      file = await fileOpen({ extensions: [".csv", ".txt", ".tsv"], description: "Pattern cut (CSV)" });
    } catch {
      return;
    }
    const r = parsePatternCsv(await file.text(), file.name);
    if (!r.ok) return setNote({ kind: "error", lines: r.errors });
    setNote(r.warnings.length > 0 ? { kind: "warning", lines: r.warnings } : null);
    setCut(path, r.cut);
  };
  const n = cut?.angleDeg.length ?? 0;
  return (
    <div className="rf-cut">
      <span id={id} className="rf-cut-title">
        {plane === "azimuth" ? "Azimuth" : "Elevation"} pattern:{" "}
        {cut
          ? `measured cut, ${n} points, ${cut.angleDeg[0]}° to ${cut.angleDeg[n - 1]}°`
          : "analytic main beam"}
      </span>
      <span className="button-row">
        <button type="button" aria-describedby={id} onClick={() => void pick()}>
          Import pattern cut (CSV)…
        </button>
        {cut && (
          <button type="button" aria-describedby={id} onClick={() => setCut(path, undefined)}>
            Use analytic shape
          </button>
        )}
      </span>
      {note && (
        <ul className={note.kind === "error" ? "field-error" : "rf-warning"} role="status">
          {note.kind === "error" && <li>Not imported; the pattern in use is unchanged.</li>}
          {note.lines.map((l) => (
            <li key={l}>{l}</li>
          ))}
        </ul>
      )}
      <FieldErrors id={`${id}-err`} path={path} />
    </div>
  );
}
