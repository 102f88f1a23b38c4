/** Read-only figures derived from the model as applied to the plan (src/coverage functions). */
import type { RadarModel } from "../../../coverage/radarModel";
import type { Requirement } from "../../../io/planSchema";
import { derivedFigures, REFERENCE_RCS_M2, REFERENCE_SWERLING } from "./derivedFigures";
import { siToText, UNITS } from "./formModel";

const M_PER_KM = 1000;
const SHOWN_DIGITS = 4;
const PERCENT = 100;

function num(x: number, digits = SHOWN_DIGITS): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(digits))) : "—";
}

function range(m: number): string {
  if (!Number.isFinite(m)) return "—";
  return m < M_PER_KM ? `${num(m, 3)} m` : `${siToText(Number(m.toPrecision(SHOWN_DIGITS)), UNITS.km)} km`;
}

export function DerivedPanel({ model, requirement }: { model: RadarModel; requirement: Requirement }) {
  const f = derivedFigures(model, requirement);
  const pulsed = model.waveform.kind === "pulsed";
  return (
    <aside className="rf-derived" aria-label="Derived figures" data-testid="rf-derived">
      <h4>Derived (as applied)</h4>
      <dl className="figures">
        <dt>Range resolution</dt>
        <dd data-testid="rf-d-resolution">{range(f.rangeResolutionM)}</dd>
        <dt>Blind zone</dt>
        <dd data-testid="rf-d-blind">{range(f.blindZoneM)}</dd>
        {pulsed ? (
          <>
            <dt>Unambiguous range</dt>
            <dd>{range(f.unambiguousRangeM)}</dd>
          </>
        ) : (
          <>
            <dt>IF-limited max range</dt>
            <dd data-testid="rf-d-if-range">{range(f.fmcwMaxRangeM)}</dd>
          </>
        )}
        <dt>Duty cycle</dt>
        <dd>{num(f.dutyCycle * PERCENT, 3)} %</dd>
        <dt>Average power</dt>
        <dd>{num(f.averagePowerW, 3)} W</dd>
        <dt>Required SNR</dt>
        <dd>{num(f.requiredSnrDb, 3)} dB</dd>
        <dt>Free-space range</dt>
        <dd data-testid="rf-d-range">{range(f.freeSpaceRangeM)}</dd>
      </dl>
      <p className="muted">
        Free-space range: a {REFERENCE_RCS_M2} m² Swerling {REFERENCE_SWERLING} target at Pd{" "}
        {requirement.requiredPd}, <span className="rf-nowrap">Pfa {requirement.pfa.toExponential()}</span>,{" "}
        {requirement.looks} look
        {requirement.looks === 1 ? "" : "s"}, peak gains, no terrain, atmosphere or instrumented-range limit.
      </p>
    </aside>
  );
}
