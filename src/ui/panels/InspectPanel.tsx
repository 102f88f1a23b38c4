/**
 * Inspect a point: per radar the link budget (every term in dB), visibility, lowest visible height,
 * diffraction loss, Pd and the reason it is not covered; and the terrain profile from the radar.
 */
import { lazy, Suspense } from "react";
import type { PointRadar } from "../../workers/protocol";
import { ColumnHeads } from "../components/ColumnHeads";
import { useCoverage } from "../coverageState";
import { formatDb as db, formatLatLon } from "../numberText";
import { radarsByPd } from "../selection";
import { useSession } from "../session";

const ProfileChart = lazy(() => import("../components/ProfileChart"));

const M_PER_KM = 1000;

function RadarRows({ r }: { r: PointRadar }) {
  return (
    <details className="point-radar" open data-testid={`point-radar-${r.postId}`}>
      <summary>
        {r.postName}: Pd {r.pd.toFixed(3)} — {r.reason}
      </summary>
      <dl className="figures">
        <dt>Slant range</dt>
        <dd>{(r.rangeM / M_PER_KM).toFixed(3)} km</dd>
        <dt>Bearing from the radar</dt>
        <dd>{r.azimuthDeg.toFixed(1)}°</dd>
        <dt>Line of sight</dt>
        <dd>{r.visible ? "clear" : "obstructed"}</dd>
        <dt>Lowest visible height here</dt>
        <dd>
          {Number.isFinite(r.lowestVisibleAglM) ? `${r.lowestVisibleAglM.toFixed(1)} m AGL` : "not seen"}
        </dd>
        <dt>Diffraction loss (two way)</dt>
        <dd>{db(r.diffractionLossDb)} dB</dd>
        <dt>SNR</dt>
        <dd>{db(r.snrDb)} dB</dd>
      </dl>
      <table className="budget" data-testid="link-budget">
        <caption>Link budget</caption>
        <ColumnHeads names={["Term", "Value", "Adds to SNR"]} />
        <tbody>
          {r.budget.map((b) => (
            <tr key={b.label} className={b.kind === "result" ? "result" : undefined}>
              <th scope="row">{b.label}</th>
              <td className="num">
                {db(b.valueDb)} {b.unit}
              </td>
              <td className="num">{db(b.contributionDb)} dB</td>
            </tr>
          ))}
        </tbody>
      </table>
    </details>
  );
}

export function InspectPanel() {
  const point = useCoverage((s) => s.point);
  const busy = useCoverage((s) => s.pointBusy);
  const tool = useSession((s) => s.tool);
  const set = useSession((s) => s.set);
  const profileOf = useSession((s) => s.profilePostId);
  // The most useful radar first: highest Pd at the point.
  const radars = radarsByPd(point);
  const radar = radars.find((r) => r.postId === profileOf) ?? radars[0];
  return (
    <div className="panel" data-testid="inspect-panel">
      <button
        type="button"
        aria-pressed={tool === "inspect"}
        onClick={() => set({ tool: tool === "inspect" ? "select" : "inspect" })}
        data-testid="tool-inspect"
      >
        {tool === "inspect" ? "Click a point on the map (Esc to stop)" : "Inspect a point"}
      </button>
      {busy && <p role="status">Computing the point…</p>}
      {point && (
        <>
          <p data-testid="point-summary">
            {formatLatLon(point.latDeg, point.lonDeg)} at {point.heightM} m AGL: combined Pd{" "}
            <strong data-testid="point-combined-pd">
              {Number.isFinite(point.combinedPd) ? point.combinedPd.toFixed(3) : "—"}
            </strong>{" "}
            (required {point.requiredPd})
          </p>
          {point.radars.length === 0 && <p className="muted">No enabled radar.</p>}
          {radar?.profile && (
            <div className="profile">
              <label className="field">
                <span>Terrain profile from</span>
                <select value={radar.postId} onChange={(e) => set({ profilePostId: e.target.value })}>
                  {radars.map((r) => (
                    <option key={r.postId} value={r.postId}>
                      {r.postName}
                    </option>
                  ))}
                </select>
              </label>
              <Suspense fallback={<p>Loading the chart…</p>}>
                <ProfileChart profile={radar.profile} title={`${radar.postName} → point`} />
              </Suspense>
            </div>
          )}
          {radars.map((r) => (
            <RadarRows key={r.postId} r={r} />
          ))}
        </>
      )}
      {!point && !busy && <p className="muted">Choose "Inspect a point" and click the map.</p>}
    </div>
  );
}
