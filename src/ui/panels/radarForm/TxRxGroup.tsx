/** Carrier frequency, transmitter power and receiver noise and losses. */
import { NumberInput } from "./FormFields";
import { TXRX_FIELDS } from "./formModel";

export function TxRxGroup() {
  return (
    <fieldset className="rf-group">
      <legend>Transmitter and receiver</legend>
      {TXRX_FIELDS.map((s) => (
        <NumberInput key={s.path} spec={s} />
      ))}
    </fieldset>
  );
}
