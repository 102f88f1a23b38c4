/** Instrumented ranges, update interval and detection-decision settings. */
import { NumberInput } from "./FormFields";
import { RANGE_FIELDS } from "./formModel";

export function RangesGroup() {
  return (
    <fieldset className="rf-group">
      <legend>Ranges and update</legend>
      {RANGE_FIELDS.map((s) => (
        <NumberInput key={s.path} spec={s} />
      ))}
    </fieldset>
  );
}
