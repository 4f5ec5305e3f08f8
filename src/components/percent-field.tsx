import { useState } from 'react';
import { TextField } from '@/components/text-field';

type PercentFieldProps = {
  label: string;
  hint?: string;
  error?: string;
  /** A fraction (0.7), shown and typed as a percentage (70). NaN while the text is not a number. */
  value: number;
  onChange: (fraction: number) => void;
  onBlur?: () => void;
  name?: string;
  min?: number;
  max?: number;
  step?: number;
  className?: string;
};

const asText = (fraction: number) => (Number.isFinite(fraction) ? String(Number((fraction * 100).toFixed(4))) : '');

/** A number field for a rate: the person types a percentage, the form holds the fraction. */
export function PercentField({ label, hint, error, value, onChange, onBlur, name, min = 0, max = 100, step = 0.1, className }: PercentFieldProps) {
  const [text, setText] = useState(() => asText(value));
  const [seen, setSeen] = useState(value);
  // Follow a value set from outside (a reset, another control). Object.is: NaN (an empty or
  // unreadable field) equals itself, else clearing the field would re-render without end.
  if (!Object.is(value, seen)) {
    setSeen(value);
    if (Number(text) / 100 !== value) setText(asText(value));
  }
  return (
    <div className={className}>
      <TextField
        label={`${label} (%)`}
        hint={hint}
        error={error}
        type="number"
        inputMode="decimal"
        min={min}
        max={max}
        step={step}
        name={name}
        value={text}
        onBlur={onBlur}
        onChange={(event) => {
          setText(event.target.value);
          const number = event.target.value.trim() === '' ? Number.NaN : Number(event.target.value);
          const fraction = Number.isFinite(number) ? number / 100 : Number.NaN;
          setSeen(fraction);
          onChange(fraction);
        }}
      />
    </div>
  );
}
