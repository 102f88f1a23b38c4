/** A short first-run hint; dismissed once, remembered in localStorage. */
import { useState } from "react";

const KEY = "picket.hint.dismissed";

export function FirstRunHint() {
  const [open, setOpen] = useState(() => {
    try {
      return localStorage.getItem(KEY) !== "1";
    } catch {
      return true;
    }
  });
  if (!open) return null;
  const close = () => {
    try {
      localStorage.setItem(KEY, "1");
    } catch {
      // storage blocked: the hint simply shows again next time
    }
    setOpen(false);
  };
  return (
    <aside className="hint" aria-label="Getting started" data-testid="first-run-hint">
      <h2>Getting started</h2>
      <ol>
        <li>
          The demo site is already evaluated: pick a target height on the right to see where a drone is
          detected.
        </li>
        <li>Hatched cells are gaps: parts of the protected area or approach ring below the required Pd.</li>
        <li>Choose a post on the left to move it, change its mast, boresight or radar; coverage follows.</li>
        <li>Click the map with "Inspect" to read the link budget and the terrain profile at a point.</li>
        <li>Everything stays on this computer and is saved as you work.</li>
      </ol>
      <button type="button" onClick={close} data-testid="hint-dismiss">
        Got it
      </button>
    </aside>
  );
}
