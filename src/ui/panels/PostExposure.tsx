/**
 * The RF-exposure compliance distances of a post's radar with its antenna stopped (the case to plan
 * for), per standard and population, beside the antenna's height above ground.
 */

import type { RadarModel } from "../../coverage/radarModel";
import { radarExposure } from "../../coverage/rfExposure";
import { ColumnHeads } from "../components/ColumnHeads";

/** Distances shown to the centimetre: far-field estimates are not better than that. */
const DISTANCE_DIGITS = 2;

export function PostExposure({ model, antennaAglM }: { model: RadarModel; antennaAglM: number }) {
  const rows = radarExposure(model).stopped.filter((r) => Number.isFinite(r.distanceM));
  if (rows.length === 0) return null;
  const publicM = Math.max(...rows.filter((r) => r.population === "general public").map((r) => r.distanceM));
  return (
    <section className="post-exposure" aria-label="RF exposure" data-testid="post-exposure">
      <table className="budget">
        <caption>RF exposure, antenna stopped (far field, beam axis)</caption>
        <ColumnHeads names={["Limit", "Distance"]} />
        <tbody>
          {rows.map((r) => (
            <tr key={`${r.standard}-${r.population}`}>
              <th scope="row">
                {r.standard}, {r.population}
              </th>
              <td className="num">{r.distanceM.toFixed(DISTANCE_DIGITS)} m</td>
            </tr>
          ))}
        </tbody>
      </table>
      {publicM > antennaAglM && (
        <p className="field-error" role="alert" data-testid="exposure-warning">
          The general-public distance ({publicM.toFixed(DISTANCE_DIGITS)} m) is more than the antenna's height
          above ground ({antennaAglM} m): people on the ground or on nearby roofs may be in the beam. Check
          the beam's path and keep those places out of reach.
        </p>
      )}
      <p className="muted">
        Estimates only: see About & safety, and defer to local rules and licensed practice.
      </p>
    </section>
  );
}
