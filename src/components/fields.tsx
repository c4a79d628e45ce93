/**
 * Inputs that validate as the user types and commit on Enter or leaving the field (one undo step
 * per edit). Enter and Tab commit alike (same checks, same save). An invalid entry is never written:
 * it stays in the field with its message, and Escape puts back the stored value (the next value
 * typed is checked and saved like any other). A warning (implausible but possible) is written and stays visible.
 */
import { useCallback, useEffect, useId, useLayoutEffect, useRef, useState, type CSSProperties, type KeyboardEvent, type MouseEvent, type ReactNode, type RefObject } from 'react';
import { flushSync } from 'react-dom';
import { useFormat } from './format';
import { checkNumber, checkText, type NumberRuleKey, type SayNumbers, type TextRuleKey } from '../state/field-rules';

export interface Verdict {
  /** Blocks the commit; says exactly what is wrong. */
  error?: string | undefined;
  /** Commits, but stays visible beside the value. */
  warning?: string | undefined;
}

/**
 * A stored number field's rule (state/field-rules.ts) applied to a value as typed, for a NumberField's
 * `validate`: `toStored` turns the typed value into the stored one (% → fraction, °F → °C); blank
 * passes (the field's `allowEmpty` decides). The message writes numbers as the user types them.
 */
export function ruleVerdict(rule: NumberRuleKey, v: number | null, words: SayNumbers, toStored: (typed: number) => number = (x) => x): Verdict {
  if (v === null) return {};
  const refused = checkNumber(rule, toStored(v), undefined, words);
  return refused ? { error: refused } : {};
}

interface CommonProps {
  label: string;
  /** No visible label, e.g. inside a table cell: the label is the control's aria-label (read by screen readers). */
  hideLabel?: boolean;
  className?: string;
  /** Width in characters. */
  size?: number;
  disabled?: boolean;
  hint?: ReactNode;
  /**
   * Drawn as light text until the user edits it (a table of many fields: an input or a select with its
   * options costs several times a line of text to draw). The text is focusable in the same Tab order,
   * carries the same accessible name and shows the value; Enter, F2, a click or a typing key draw the
   * field focused (a typing key with the text selected, so that what it types replaces it, as after Tab). The field is drawn again as text
   * once nothing is pending — after Escape, after Enter or leaving the field committed — but stays a
   * field while it holds a refused entry or its stored value has a message. Needs `hideLabel`.
   */
  textUntilEdited?: boolean;
}

/**
 * Whether a key pressed on a field drawn as text opens the field: Enter and F2, and a key that types
 * (a character, Backspace, Delete, a paste: Ctrl+V, Shift+Insert). The field opens focused with its text selected, as Tab into
 * a field selects it, so the typed key's own input then lands in the field and replaces the text.
 */
function opensField(e: KeyboardEvent): boolean {
  if (e.key === 'Enter' || e.key === 'F2') return true;
  if (e.ctrlKey || e.metaKey) return !e.altKey && (e.key === 'v' || e.key === 'V');
  if (e.altKey) return false;
  if (e.key === 'Insert') return e.shiftKey; // Shift+Insert pastes too
  return e.key === 'Backspace' || e.key === 'Delete' || [...e.key].length === 1;
}

/**
 * Draw the field in place of its text at once (so that the next key already reaches it) and focus it:
 * `caret` 'all' selects the text, 'end' puts the caret after it.
 */
function openInPlace(box: HTMLElement | null, caret: 'all' | 'end', draw: () => void): void {
  flushSync(draw);
  const el = box?.querySelector<HTMLInputElement | HTMLTextAreaElement | HTMLSelectElement>('input, textarea, select');
  if (!el) return;
  el.focus();
  if (el instanceof HTMLSelectElement) return;
  if (caret === 'all') el.select();
  else el.setSelectionRange(el.value.length, el.value.length);
}

/**
 * Back to text once nothing is pending (Escape, or Enter that committed): the text takes the focus,
 * unless the commit moved it elsewhere (a confirmation opened).
 */
function closeInPlace(box: HTMLElement | null, draw: () => void): void {
  flushSync(draw);
  const active = document.activeElement;
  if (active && active !== document.body && active.isConnected && !box?.contains(active)) return;
  box?.querySelector<HTMLElement>('.cell-text')?.focus();
}

/**
 * The text of a text or number field drawn as text (see `textUntilEdited`), inside the field's box: a
 * click or an opening key draws the field in its place (`setOpen(true)`), focused at once.
 */
function TextCell(props: { label: string; text: string; size: number; wrap?: boolean; title?: string | undefined; setOpen: (open: boolean) => void }) {
  const open = (box: HTMLElement | null, caret: 'all' | 'end') => openInPlace(box, caret, () => props.setOpen(true));
  return (
    <span
      role="textbox"
      tabIndex={0}
      aria-label={props.label}
      aria-multiline={props.wrap || undefined}
      className={props.wrap ? 'cell-text wrap-line' : 'cell-text'}
      style={props.wrap ? undefined : ({ '--size': props.size } as CSSProperties)}
      title={props.title}
      onClick={(e: MouseEvent<HTMLElement>) => open(e.currentTarget.parentElement, 'end')}
      onKeyDown={(e) => {
        if (!opensField(e)) return;
        // Enter only opens; a typing key's input goes on to the field, focused by now.
        if (e.key === 'Enter') e.preventDefault();
        open(e.currentTarget.parentElement, 'all');
      }}
    >
      {props.text}
    </span>
  );
}

/**
 * A field's visible label; a hidden label (inside a table cell) is the control's `aria-label`
 * instead — the same accessible name without a clipped element per field.
 */
function FieldLabel({ id, label, hide }: { id: string; label: string; hide: boolean | undefined }) {
  return hide ? null : (
    <label htmlFor={id} className="field-label">
      {label}
    </label>
  );
}

function Message({ id, verdict }: { id: string; verdict: Verdict }) {
  if (verdict.error) {
    return (
      <span id={id} className="field-msg field-error" role="alert">
        {verdict.error}
      </span>
    );
  }
  if (verdict.warning) {
    return (
      <span id={id} className="field-msg field-warning">
        {verdict.warning}
      </span>
    );
  }
  return null;
}

export interface NumberFieldProps extends CommonProps {
  value: number | null;
  onCommit: (v: number | null) => void;
  /** Decimals shown when not editing; undefined → as stored. */
  digits?: number;
  allowEmpty?: boolean;
  unit?: string;
  validate?: (v: number | null) => Verdict;
  /**
   * Told what is being typed, before it is committed: the number read from the text (even one the
   * checks refuse), null when the text is not a number, undefined when nothing is pending. Lets a
   * row show a derived value (VI, grade) for the pair on screen rather than for the stored pair.
   */
  onDraft?: (v: number | null | undefined) => void;
}

export function NumberField(props: NumberFieldProps) {
  const fmt = useFormat();
  const id = useId();
  const msgId = `${id}-msg`;
  const show = (v: number | null) => (v === null ? '' : fmt.plain(v, props.digits));
  // Only a value the user typed is committed: a displayed, rounded value is never written back.
  // While nothing is typed, the field shows the stored value (undo, another tab, another field):
  // derived at render, so a field mounts without effects (a table of stocks holds hundreds).
  const [draft, setDraft] = useState('');
  const [dirty, setDirty] = useState(false);
  const text = dirty ? draft : show(props.value);

  const judge = (text: string): { v: number | null; verdict: Verdict } => {
    const r = fmt.parseEntry(text);
    if (r.error !== undefined) return { v: null, verdict: { error: `${props.label}: ${r.error}` } };
    const v = r.value;
    if (v === null) {
      return { v, verdict: props.allowEmpty ? props.validate?.(null) ?? {} : { error: `${props.label}: a value is required` } };
    }
    if (!Number.isFinite(v)) return { v, verdict: { error: `${props.label}: must be a finite number` } };
    return { v, verdict: props.validate?.(v) ?? {} };
  };
  const current = dirty ? judge(draft) : { v: props.value, verdict: props.validate?.(props.value) ?? {} };
  // What is being typed goes to `onDraft` as it is typed, and undefined once nothing is pending
  // (told in the same event, so the row re-renders once).
  const { onDraft } = props;
  /**
   * Enter and leaving the field (Tab, click elsewhere) both come here: same checks, same save.
   * False when the typed value was refused (it stays in the field with its message).
   */
  const commit = (): boolean => {
    if (!dirty) return true;
    const { v, verdict } = judge(draft);
    if (verdict.error) return false;
    setDirty(false);
    onDraft?.(undefined);
    if (v !== props.value) props.onCommit(v);
    return true;
  };
  const revert = () => {
    setDirty(false);
    onDraft?.(undefined);
  };
  const hasMsg = Boolean(current.verdict.error || current.verdict.warning);
  // Drawn as text until edited (see `textUntilEdited`): open while the user works in it.
  const [open, setOpen] = useState(false);
  if (props.textUntilEdited && !open && !dirty && !hasMsg && !props.disabled) {
    return (
      <span className={`field ${props.className ?? ''}`}>
        <TextCell label={props.label} text={text} size={props.size ?? 7} setOpen={setOpen} />
        {props.hint}
      </span>
    );
  }
  const close = (box: HTMLElement | null) => closeInPlace(box, () => setOpen(false));
  return (
    <span className={`field ${props.className ?? ''}`}>
      {props.hideLabel ? null : (
        <label htmlFor={id} className="field-label">
          {props.label}
          {props.unit ? <span className="unit"> [{props.unit}]</span> : null}
        </label>
      )}
      <input
        id={id}
        aria-label={props.hideLabel ? props.label : undefined}
        type="text"
        inputMode="decimal"
        autoComplete="off"
        size={props.size ?? 7}
        disabled={props.disabled}
        value={text}
        aria-invalid={current.verdict.error ? true : undefined}
        aria-describedby={hasMsg ? msgId : undefined}
        className={current.verdict.error ? 'invalid' : current.verdict.warning ? 'doubtful' : undefined}
        onChange={(e) => {
          setDraft(e.target.value);
          setDirty(true);
          onDraft?.(fmt.parseEntry(e.target.value).value ?? null);
        }}
        onBlur={() => {
          commit();
          setOpen(false);
        }}
        onKeyDown={(e) => {
          // A refused value must not submit the form around the field with the old value.
          if (e.key === 'Enter') {
            if (!commit()) e.preventDefault();
            else if (props.textUntilEdited) close(e.currentTarget.parentElement);
          } else if (e.key === 'Escape') {
            revert();
            if (props.textUntilEdited) close(e.currentTarget.parentElement);
          }
        }}
      />
      {props.hint}
      <Message id={msgId} verdict={current.verdict} />
    </span>
  );
}

export interface TextFieldProps extends CommonProps {
  value: string;
  onCommit: (v: string) => void;
  validate?: (v: string) => Verdict;
  /**
   * The stored field's rule (field-rules.ts): its length and characters are checked as typed, with the
   * rule's own message, before `validate`. No `maxLength` then: a pasted over-long text is refused with
   * its message, never cut short silently.
   */
  rule?: TextRuleKey;
  /** Trim the value before the rule checks it (for fields whose commit trims). */
  trimForRule?: boolean;
  multiline?: boolean;
  maxLength?: number;
  placeholder?: string;
  /** Show the whole text as the field's title (a tooltip) when the field is narrower than the text. */
  fullTitle?: boolean;
  /**
   * One line of text that wraps inside its field and grows to as many lines as the text needs, so a
   * long name is read whole in a narrow column (a textarea without line breaks: Enter saves like
   * Tab, a pasted line break becomes a space).
   */
  wrap?: boolean;
}

/**
 * Where CSS `field-sizing: content` is not supported, a wrapping line's height follows its text by
 * hand: set to its scroll height when the text or the field's width changes.
 */
const SIZED_BY_CSS = typeof CSS !== 'undefined' && CSS.supports?.('field-sizing', 'content') === true;

function useGrowToText(ref: RefObject<HTMLTextAreaElement | null>, on: boolean, text: string): void {
  const fit = useCallback(() => {
    const el = ref.current;
    if (!el) return;
    el.style.height = 'auto';
    el.style.height = `${el.scrollHeight + el.offsetHeight - el.clientHeight}px`;
  }, [ref]);
  useLayoutEffect(() => {
    if (on) fit();
  }, [on, text, fit]);
  useEffect(() => {
    const el = ref.current;
    if (!on || !el || typeof ResizeObserver === 'undefined') return;
    let width = el.clientWidth;
    const ro = new ResizeObserver(() => {
      if (el.clientWidth !== width) {
        width = el.clientWidth;
        fit();
      }
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, [on, ref, fit]);
}

export function TextField(props: TextFieldProps) {
  const id = useId();
  const wrapRef = useRef<HTMLTextAreaElement>(null);
  const msgId = `${id}-msg`;
  // While nothing is typed the field shows the stored value (derived at render: no effect per field).
  const [draft, setDraft] = useState('');
  const [dirty, setDirty] = useState(false);
  const text = dirty ? draft : props.value;
  const judge = (v: string): Verdict => {
    const ruled = props.rule ? checkText(props.rule, props.trimForRule ? v.trim() : v) : null;
    return ruled ? { error: ruled } : (props.validate?.(v) ?? {});
  };
  const verdict = judge(text);
  // Where the browser sizes the field itself (decided once per page), no measuring, no observer and no effects.
  if (!SIZED_BY_CSS) useGrowToText(wrapRef, Boolean(props.wrap && !props.multiline), text);
  /** Enter (single line) and leaving the field both come here: same checks, same save. */
  const commit = (): boolean => {
    if (!dirty) return true;
    if (judge(draft).error) return false;
    setDirty(false);
    if (draft !== props.value) props.onCommit(draft);
    return true;
  };
  const revert = () => setDirty(false);
  // Drawn as text until edited (see `textUntilEdited`): open while the user works in it.
  const [open, setOpen] = useState(false);
  if (props.textUntilEdited && !open && !dirty && !verdict.error && !verdict.warning && !props.disabled) {
    const shown = { text, size: props.size ?? 14, wrap: Boolean(props.wrap && !props.multiline), title: props.fullTitle && text ? text : undefined };
    return (
      <span className={`field ${props.className ?? ''}`}>
        <TextCell label={props.label} {...shown} setOpen={setOpen} />
      </span>
    );
  }
  const close = (box: HTMLElement | null) => closeInPlace(box, () => setOpen(false));
  const common = {
    id,
    'aria-label': props.hideLabel ? props.label : undefined,
    value: text,
    disabled: props.disabled,
    maxLength: props.rule ? undefined : props.maxLength,
    placeholder: props.placeholder,
    title: props.fullTitle && text ? text : undefined,
    'aria-invalid': verdict.error ? true : undefined,
    'aria-describedby': verdict.error || verdict.warning ? msgId : undefined,
    className: verdict.error ? 'invalid' : undefined,
    onBlur: () => {
      commit();
      setOpen(false);
    },
  } as const;
  const change = (v: string) => {
    setDraft(v);
    setDirty(true);
  };
  return (
    <span className={`field ${props.className ?? ''}`}>
      <FieldLabel id={id} label={props.label} hide={props.hideLabel} />
      {props.wrap && !props.multiline ? (
        <textarea
          {...common}
          ref={wrapRef}
          rows={1}
          className={`wrap-line${verdict.error ? ' invalid' : ''}`}
          onChange={(e) => change(e.target.value.replace(/[\r\n]+/g, ' '))}
          onKeyDown={(e) => {
            if (e.key === 'Enter') {
              e.preventDefault();
              if (commit() && props.textUntilEdited) close(e.currentTarget.parentElement);
            } else if (e.key === 'Escape') {
              revert();
              if (props.textUntilEdited) close(e.currentTarget.parentElement);
            } else if ((e.key === 'Home' || e.key === 'End') && !e.ctrlKey && !e.metaKey && !e.altKey) {
              // As in a one-line field: Home and End go to the start and end of the whole text, not of the wrapped line.
              e.preventDefault();
              const el = e.currentTarget;
              const to = e.key === 'Home' ? 0 : el.value.length;
              if (e.shiftKey) {
                const anchor = e.key === 'Home' ? el.selectionEnd : el.selectionStart;
                el.setSelectionRange(Math.min(anchor, to), Math.max(anchor, to), e.key === 'Home' ? 'backward' : 'forward');
              } else {
                el.setSelectionRange(to, to);
              }
            }
          }}
        />
      ) : props.multiline ? (
        <textarea
          {...common}
          rows={3}
          onChange={(e) => change(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === 'Escape') revert();
          }}
        />
      ) : (
        <input
          {...common}
          type="text"
          autoComplete="off"
          size={props.size ?? 14}
          onChange={(e) => change(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === 'Enter') {
              if (!commit()) e.preventDefault();
              else if (props.textUntilEdited) close(e.currentTarget.parentElement);
            } else if (e.key === 'Escape') {
              revert();
              if (props.textUntilEdited) close(e.currentTarget.parentElement);
            }
          }}
        />
      )}
      <Message id={msgId} verdict={verdict} />
    </span>
  );
}

export interface SelectFieldProps<T extends string> extends CommonProps {
  value: T;
  options: ReadonlyArray<{ value: T; label: string }>;
  onChange: (v: T) => void;
}

/** Every label of a list of choices, one a line (a choice drawn as text keeps the room its select takes: its widest). */
const labelLines = new WeakMap<ReadonlyArray<{ label: string }>, string>();
function allLabels(options: ReadonlyArray<{ label: string }>): string {
  let l = labelLines.get(options);
  if (l === undefined) {
    l = options.map((o) => o.label).join('\n');
    labelLines.set(options, l);
  }
  return l;
}

export function SelectField<T extends string>(props: SelectFieldProps<T>) {
  const id = useId();
  // Drawn as text until edited (see `textUntilEdited`): a select while the user works in it.
  const [open, setOpen] = useState(false);
  if (props.textUntilEdited && !open && !props.disabled) {
    const { options } = props;
    const at = options.findIndex((o) => o.value === props.value);
    /** Draw the select focused; `pick` chooses as the key would have on a focused select; `list` opens its list. */
    const start = (box: HTMLElement | null, pick?: number, list?: boolean) => {
      openInPlace(box, 'end', () => setOpen(true));
      const chosen = pick === undefined ? undefined : options[pick];
      if (chosen && chosen.value !== props.value) props.onChange(chosen.value);
      if (list) {
        try {
          box?.querySelector('select')?.showPicker();
        } catch {
          /* no list without a user gesture: the select is focused, its keys open it */
        }
      }
    };
    return (
      <span className={`field ${props.className ?? ''}`}>
        <span
          role="combobox"
          tabIndex={0}
          aria-label={props.label}
          aria-expanded={false}
          className="cell-text cell-choice"
          onClick={(e: MouseEvent<HTMLElement>) => start(e.currentTarget.parentElement, undefined, true)}
          onKeyDown={(e) => {
            const box = e.currentTarget.parentElement;
            if (e.ctrlKey || e.metaKey) return;
            if (e.altKey) {
              if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
                e.preventDefault();
                start(box, undefined, true);
              }
              return;
            }
            if (e.key === 'Enter' || e.key === 'F2') {
              e.preventDefault();
              start(box);
            } else if (e.key === ' ') {
              e.preventDefault();
              start(box, undefined, true);
            } else if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
              e.preventDefault();
              const next = at + (e.key === 'ArrowDown' ? 1 : -1);
              start(box, next >= 0 && next < options.length ? next : undefined);
            } else if ([...e.key].length === 1) {
              // A letter picks the next choice that starts with it, as on a focused select.
              e.preventDefault();
              const k = e.key.toLowerCase();
              const order = options.map((_, i) => (at + 1 + i) % options.length);
              start(box, order.find((i) => options[i]!.label.toLowerCase().startsWith(k)));
            }
          }}
        >
          <span>{options[at]?.label ?? props.value}</span>
          <span className="cell-choice-room" aria-hidden="true">
            {allLabels(options)}
          </span>
        </span>
      </span>
    );
  }
  return (
    <span className={`field ${props.className ?? ''}`}>
      <FieldLabel id={id} label={props.label} hide={props.hideLabel} />
      <select
        id={id}
        aria-label={props.hideLabel ? props.label : undefined}
        value={props.value}
        disabled={props.disabled}
        onChange={(e) => props.onChange(e.target.value as T)}
        onBlur={() => setOpen(false)}
        onKeyDown={(e) => {
          if (e.key === 'Escape' && open) closeInPlace(e.currentTarget.parentElement, () => setOpen(false));
        }}
      >
        {props.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </span>
  );
}
