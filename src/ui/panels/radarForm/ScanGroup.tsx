/** How the radar covers azimuth: staring, sector or rotating, with that mode's fields. */
import { ChoiceInput, NumberInput } from "./FormFields";
import { useRadarForm } from "./formContext";
import { SCAN_FIELDS, type ScanKind } from "./formModel";

const MODES = [
  { value: "rotating", label: "Rotating 360°" },
  { value: "sector", label: "Sector scan" },
  { value: "staring", label: "Staring (fixed antenna)" },
];

export function ScanGroup() {
  const { draft } = useRadarForm();
  const fields = SCAN_FIELDS[draft.texts["scan.kind"] as ScanKind] ?? SCAN_FIELDS.rotating;
  return (
    <fieldset className="rf-group">
      <legend>Scan</legend>
      <ChoiceInput path="scan.kind" label="Mode" options={MODES} />
      {fields.map((s) => (
        <NumberInput key={s.path} spec={s} />
      ))}
    </fieldset>
  );
}
