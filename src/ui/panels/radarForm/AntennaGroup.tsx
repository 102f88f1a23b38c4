/**
 * An antenna: peak gain, beamwidths, sidelobe floor, main-beam shape and measured cuts. The receive
 * antenna has a "same as transmit" checkbox that hides its fields.
 */
import { useId } from "react";
import { ChoiceInput, NumberInput } from "./FormFields";
import { useRadarForm } from "./formContext";
import { type AntennaPrefix, antennaFields } from "./formModel";
import { PatternCutRow } from "./PatternCutRow";

const SHAPES = [
  { value: "gaussian", label: "Gaussian" },
  { value: "sinc2", label: "sinc² (uniform aperture)" },
];

function AntennaFields({ prefix }: { prefix: AntennaPrefix }) {
  return (
    <>
      {antennaFields(prefix).map((s) => (
        <NumberInput key={s.path} spec={s} />
      ))}
      <ChoiceInput path={`${prefix}.mainBeam`} label="Main-beam shape" options={SHAPES} />
      <PatternCutRow path={`${prefix}.azCut`} plane="azimuth" />
      <PatternCutRow path={`${prefix}.elCut`} plane="elevation" />
    </>
  );
}

export function TxAntennaGroup() {
  return (
    <fieldset className="rf-group">
      <legend>Transmit antenna</legend>
      <AntennaFields prefix="txAntenna" />
    </fieldset>
  );
}

export function RxAntennaGroup() {
  const id = useId();
  const { draft, setRxSame } = useRadarForm();
  return (
    <fieldset className="rf-group">
      <legend>Receive antenna</legend>
      <div className="field field-check">
        <input
          id={id}
          type="checkbox"
          checked={draft.rxSame}
          data-testid="rf-rx-same"
          onChange={(e) => setRxSame(e.target.checked)}
        />
        <label htmlFor={id}>Same as transmit</label>
      </div>
      {!draft.rxSame && <AntennaFields prefix="rxAntenna" />}
    </fieldset>
  );
}
