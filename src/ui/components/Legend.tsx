/** The legend of the shown layer: ramp with labelled stops and units, and the gap symbol. */
import { tableCss } from "../../map/colourTable";
import { layerScale } from "../layerPaint";
import type { LayerKind } from "../session";

export function Legend(props: {
  kind: LayerKind;
  maxOverlap: number;
  maxHeightM: number;
  showGaps: boolean;
  showSectors?: boolean;
  showExposure?: boolean;
}) {
  const s = layerScale(props.kind, props.maxOverlap, props.maxHeightM);
  const discrete = props.kind === "overlap";
  return (
    <figure className="legend" aria-label="Legend" data-testid="legend">
      <figcaption>{s.title}</figcaption>
      {discrete ? (
        <ul className="legend-classes">
          {s.stops.map((st) => (
            <li key={st.label}>
              <span className="swatch" style={{ background: tableCss(s.table, st.index) }} />
              {st.label}
            </li>
          ))}
        </ul>
      ) : (
        <>
          <div
            className="legend-ramp"
            style={{
              background: `linear-gradient(to right, ${[0, 32, 64, 96, 128, 160, 192, 224, 255].map((i) => tableCss(s.table, i)).join(", ")})`,
            }}
          />
          <div className="legend-stops">
            {s.stops.map((st) => (
              <span key={st.label}>{st.label}</span>
            ))}
          </div>
        </>
      )}
      <div className="legend-note" data-testid="legend-uncoloured">
        {s.uncoloured}
      </div>
      {props.showGaps && (
        <div className="legend-gap">
          <span className="swatch hatch" /> Gap: below the required Pd inside the protected area or approach
          ring (outlined, area in m² or ha)
        </div>
      )}
      <div className="legend-gap">
        <span className="swatch outline-solid" /> Protected area <span className="swatch outline-dashed" />{" "}
        Approach ring
      </div>
      {props.showSectors && (
        <div className="legend-gap">
          <span className="swatch sector-dashed" /> Radar sector and maximum instrumented range
        </div>
      )}
      {props.showExposure && (
        <div className="legend-gap">
          <span className="swatch exposure-disc" /> RF-exposure distance, general public, antenna stopped
          (ICNIRP 2020; "RF n m")
        </div>
      )}
    </figure>
  );
}
