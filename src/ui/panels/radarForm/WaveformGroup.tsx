/** The waveform: a pulsed/FMCW switch and the fields of the chosen kind only. */
import { ChoiceInput, NumberInput } from "./FormFields";
import { useRadarForm } from "./formContext";
import { FMCW_FIELDS, PULSED_FIELDS } from "./formModel";

const KINDS = [
  { value: "pulsed", label: "Pulsed" },
  { value: "fmcw", label: "FMCW (linear chirps)" },
];
const SAMPLING = [
  { value: "real", label: "Real (beat to fs/2)" },
  { value: "complex", label: "Complex I/Q (beat to fs)" },
];

export function WaveformGroup() {
  const { draft } = useRadarForm();
  const fmcw = draft.texts["waveform.kind"] === "fmcw";
  return (
    <fieldset className="rf-group">
      <legend>Waveform</legend>
      <ChoiceInput path="waveform.kind" label="Kind" options={KINDS} />
      {(fmcw ? FMCW_FIELDS : PULSED_FIELDS).map((s) => (
        <NumberInput key={s.path} spec={s} />
      ))}
      {fmcw && <ChoiceInput path="waveform.ifSampling" label="IF sampling" options={SAMPLING} />}
    </fieldset>
  );
}
