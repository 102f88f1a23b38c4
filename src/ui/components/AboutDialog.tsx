/** About & safety: what Picket is, the RF and mast safety cautions, and the optional tile server. */
import { useEffect, useRef, useState } from "react";
import { RF_SAFETY_CAUTIONS } from "../../coverage/rfExposure";
import { savePlanNow } from "../autosave";
import { checkTileTemplate, needsReloadFor, useBasemap } from "../basemap";
import { say } from "../session";
import { usePlanStore } from "../store";

/** Saves the plan, then reloads so the page's image policy admits the new tile server. */
async function reloadForTiles(): Promise<void> {
  say("info", "Reloading the page to allow the new tile server; the plan is saved.");
  const plan = usePlanStore.getState().plan;
  try {
    if (plan) await savePlanNow(plan);
  } catch (e) {
    say(
      "error",
      `The plan could not be saved, so the page was not reloaded: ${String(e)}. Reload it yourself after saving the plan file.`,
    );
    return;
  }
  location.reload();
}

function TileServerForm() {
  const server = useBasemap((s) => s.server);
  const setServer = useBasemap((s) => s.setServer);
  const [url, setUrl] = useState(server?.urlTemplate ?? "");
  const [attribution, setAttribution] = useState(server?.attribution ?? "");
  const [error, setError] = useState<string | null>(null);
  return (
    <form
      className="tile-form"
      onSubmit={(e) => {
        e.preventDefault();
        if (url.trim() === "") {
          setServer(null);
          return setError(null);
        }
        const problem = checkTileTemplate(url.trim());
        if (problem) return setError(problem);
        if (attribution.trim() === "") return setError("give the attribution the tile provider asks for");
        setError(null);
        const next = { urlTemplate: url.trim(), attribution: attribution.trim() };
        setServer(next);
        if (needsReloadFor(next)) void reloadForTiles();
      }}
    >
      <h3>Basemap tiles (optional)</h3>
      <p className="muted">
        Off by default: the map shows a hillshade of the site's DEM and makes no network request. A tile
        server you set here is the only address Picket contacts; the page reloads to allow it (your plan is
        saved first and comes back as it was).
      </p>
      <label>
        Tile URL template
        <input value={url} onChange={(e) => setUrl(e.target.value)} placeholder="https://…/{z}/{x}/{y}.png" />
      </label>
      <label>
        Attribution
        <input value={attribution} onChange={(e) => setAttribution(e.target.value)} />
      </label>
      {error && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
      <button type="submit">{url.trim() ? "Use this tile server" : "Offline basemap only"}</button>
    </form>
  );
}

export function AboutDialog(props: { open: boolean; onClose: () => void }) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (props.open && !d.open) d.showModal();
    if (!props.open && d.open) d.close();
  }, [props.open]);
  return (
    <dialog
      ref={ref}
      className="about"
      onClose={props.onClose}
      aria-labelledby="about-title"
      data-testid="about-dialog"
    >
      <h2 id="about-title">About Picket, and safety</h2>
      <p>
        Picket plans radar coverage for a site: where a target of a given RCS is detected at each height with
        the required Pd, where radars overlap, and where terrain, buildings or trees leave gaps. It runs
        entirely in this browser; no plan or result leaves this computer. Radar models shipped with it are
        invented examples.
      </p>
      <h3>RF exposure and work at height</h3>
      <ul className="cautions" data-testid="safety-cautions">
        {RF_SAFETY_CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
      <TileServerForm />
      <button type="button" onClick={props.onClose}>
        Close
      </button>
    </dialog>
  );
}
