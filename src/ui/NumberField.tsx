/**
 * A numeric text field that applies every valid edit at once (the overlay follows typing) and marks
 * an invalid one without applying it. Arrow up/down nudge the last typed digit.
 */
import { useEffect, useId, useState } from 'react';
import { nudgeText } from './nudgeText';

export interface NumberFieldProps {
  label: string;
  value: number;
  /** Apply a parsed value; return an error sentence to refuse it. */
  onCommit: (value: number) => string | null;
  /** Formatting of the stored value. @default String */
  format?: (v: number) => string;
  /** Hide the visible label (it stays the accessible name). */
  isLabelHidden?: boolean;
  className?: string;
  unit?: string;
  isDisabled?: boolean;
  testId?: string;
}

export function NumberField(props: NumberFieldProps) {
  const format = props.format ?? String;
  const [draft, setDraft] = useState(format(props.value));
  const [error, setError] = useState<string | null>(null);
  const [isFocused, setFocused] = useState(false);
  const id = useId();
  useEffect(() => {
    if (!isFocused) {
      setDraft(format(props.value));
      setError(null);
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [props.value, isFocused]);

  const apply = (text: string) => {
    setDraft(text);
    const t = text.trim();
    const v = t === '' ? NaN : Number(t);
    if (!Number.isFinite(v)) {
      setError(`"${text}" is not a number`);
      return;
    }
    const err = props.onCommit(v);
    setError(err);
  };

  return (
    <span className={`number-field ${props.className ?? ''} ${error ? 'invalid' : ''}`}>
      <label htmlFor={id} className={props.isLabelHidden ? 'visually-hidden' : ''}>
        {props.label}
      </label>
      <input
        id={id}
        type="text"
        inputMode="decimal"
        spellCheck={false}
        value={draft}
        disabled={props.isDisabled}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-err` : undefined}
        data-testid={props.testId}
        onFocus={() => setFocused(true)}
        onBlur={() => setFocused(false)}
        onChange={(e) => apply(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === 'ArrowUp' || e.key === 'ArrowDown') {
            const n = nudgeText(draft, e.key === 'ArrowUp' ? 1 : -1);
            if (n !== null) {
              e.preventDefault();
              apply(n);
            }
          }
          if (e.key === 'Enter') (e.target as HTMLInputElement).blur();
        }}
      />
      {props.unit && <span className="unit">{props.unit}</span>}
      {error && (
        <span id={`${id}-err`} className="field-error" role="alert">
          {error}
        </span>
      )}
    </span>
  );
}
