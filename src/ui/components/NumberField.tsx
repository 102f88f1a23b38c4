/**
 * A labelled number input with its unit beside it. The value is committed on Enter or when the field
 * loses focus, only when it is a finite number inside [min, max]; otherwise the field says why and the
 * plan keeps its value.
 */
import { useEffect, useId, useState } from "react";
import { parseTypedNumber } from "../numberText";

export interface NumberFieldProps {
  label: string;
  /** The unit beside the field and in its messages ("" for a pure number). */
  unit: string;
  /** Shown beside the field instead of the unit, never in messages: "(0–1)". */
  hint?: string;
  value: number;
  min?: number;
  max?: number;
  step?: number;
  /** Digits shown after the decimal point. */
  digits?: number;
  onCommit: (value: number) => void;
  testId?: string;
  disabled?: boolean;
}

export function NumberField(p: NumberFieldProps) {
  const id = useId();
  const shown = (v: number) => (p.digits === undefined ? String(v) : v.toFixed(p.digits));
  const [text, setText] = useState(shown(p.value));
  const [error, setError] = useState<string | null>(null);
  // biome-ignore lint/correctness/useExhaustiveDependencies: reformat only when the value changes
  useEffect(() => {
    setText(shown(p.value));
    setError(null);
  }, [p.value]);
  const commit = () => {
    // Untouched (e.g. focus passing through): no change, even where the shown value is rounded.
    if (text === shown(p.value)) return setError(null);
    const typed = parseTypedNumber(text);
    if (!typed.ok) return setError(`${p.label}: ${typed.reason}`);
    const v = typed.value;
    const u = p.unit === "" ? "" : ` ${p.unit}`;
    if (p.min !== undefined && v < p.min) return setError(`${p.label}: ${v}${u} is below ${p.min}${u}`);
    if (p.max !== undefined && v > p.max) return setError(`${p.label}: ${v}${u} is above ${p.max}${u}`);
    setError(null);
    if (v !== p.value) p.onCommit(v);
  };
  return (
    <div className="field">
      <label htmlFor={id}>{p.label}</label>
      <span className="field-input">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          value={text}
          disabled={p.disabled}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-err` : undefined}
          data-testid={p.testId}
          onChange={(e) => setText(e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => {
            if (e.key === "Enter") commit();
            if (e.key === "Escape") setText(shown(p.value));
          }}
        />
        <span className="unit">{p.hint ?? p.unit}</span>
      </span>
      {error && (
        <span className="field-error" id={`${id}-err`} role="alert">
          {error}
        </span>
      )}
    </div>
  );
}

export interface TextFieldProps {
  label: string;
  value: string;
  onCommit: (value: string) => void;
  maxLength?: number;
  testId?: string;
}

export function TextField(p: TextFieldProps) {
  const id = useId();
  const [text, setText] = useState(p.value);
  useEffect(() => setText(p.value), [p.value]);
  const commit = () => {
    const t = text.trim();
    if (t !== "" && t !== p.value) p.onCommit(t);
    else setText(p.value);
  };
  return (
    <div className="field">
      <label htmlFor={id}>{p.label}</label>
      <input
        id={id}
        type="text"
        value={text}
        maxLength={p.maxLength ?? 120}
        data-testid={p.testId}
        onChange={(e) => setText(e.target.value)}
        onBlur={commit}
        onKeyDown={(e) => e.key === "Enter" && commit()}
      />
    </div>
  );
}

export interface SelectFieldProps<T extends string> {
  label: string;
  value: T;
  options: ReadonlyArray<{ value: T; label: string }>;
  onChange: (value: T) => void;
  testId?: string;
}

export function SelectField<T extends string>(p: SelectFieldProps<T>) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>{p.label}</label>
      <select
        id={id}
        value={p.value}
        data-testid={p.testId}
        onChange={(e) => p.onChange(e.target.value as T)}
      >
        {p.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

export function CheckField(p: {
  label: string;
  checked: boolean;
  onChange: (v: boolean) => void;
  testId?: string;
  /** Shown as the reason the box cannot be changed; the box is disabled while it is set. */
  lockedBecause?: string;
}) {
  const id = useId();
  return (
    <div className="field field-check" title={p.lockedBecause}>
      <input
        id={id}
        type="checkbox"
        checked={p.checked}
        disabled={p.lockedBecause !== undefined}
        data-testid={p.testId}
        onChange={(e) => p.onChange(e.target.checked)}
      />
      <label htmlFor={id}>{p.label}</label>
    </div>
  );
}
