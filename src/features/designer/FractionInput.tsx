import { memo, useEffect, useState } from 'react';
import { useFormat } from '../../components/format';

export interface FractionInputProps {
  /** Accessible label, e.g. "Mass % of BW-240". */
  label: string;
  /** Share 0–1. */
  value: number;
  /** Called on every keystroke that gives a valid percentage (live recomputation). */
  onEdit: (fraction: number) => void;
  disabled?: boolean;
}

/** A percentage cell that recomputes the blend while the user types; shows the stored value on leaving. */
export const FractionInput = memo(function FractionInput({ label, value, onEdit, disabled }: FractionInputProps) {
  const fmt = useFormat();
  const show = (v: number) => fmt.num(v * 100, 2);
  const [text, setText] = useState(() => show(value));
  const [editing, setEditing] = useState(false);
  const [error, setError] = useState('');
  useEffect(() => {
    if (!editing) setText(show(value));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value, editing, fmt]);
  return (
    <>
      <input
        type="text"
        inputMode="decimal"
        autoComplete="off"
        className={`pct-input${error ? ' invalid' : ''}`}
        aria-label={label}
        aria-invalid={error ? true : undefined}
        title={error || undefined}
        size={7}
        disabled={disabled}
        value={text}
        onFocus={() => setEditing(true)}
        onBlur={() => {
          setEditing(false);
          setError('');
          setText(show(value));
        }}
        onKeyDown={(e) => {
          if (e.key === 'Enter' || e.key === 'Escape') {
            setError('');
            setText(show(value));
          } else if (e.key === 'ArrowUp' || e.key === 'ArrowDown') {
            e.preventDefault();
            const step = (e.shiftKey ? 1 : 0.1) * (e.key === 'ArrowUp' ? 1 : -1);
            const next = Math.min(100, Math.max(0, value * 100 + step));
            onEdit(next / 100);
            setText(fmt.num(next, 2));
          }
        }}
        onChange={(e) => {
          const t = e.target.value;
          setText(t);
          const v = fmt.parse(t);
          if (v === null) return setError('');
          if (Number.isNaN(v)) return setError('Not a number');
          if (v < 0 || v > 100) return setError('Between 0 and 100 %');
          setError('');
          onEdit(v / 100);
        }}
      />
    </>
  );
});
