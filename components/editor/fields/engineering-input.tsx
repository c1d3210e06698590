'use client';

import { useId, useState, type KeyboardEvent, type ReactNode } from 'react';
import { formatInputValue } from '@/lib/editor/format';
import { decideCommit, type FieldRule } from '@/lib/editor/fields';

interface EngineeringInputBase {
  label: ReactNode;
  /** SI unit shown beside the field and accepted after the number (`''` for a plain number). */
  unit: string;
  /** Extra check after the rule: a reason to refuse the value, or null. */
  validate?: (value: number) => string | null;
  /** The schema rule the value must meet (default: any finite number). */
  rule?: FieldRule;
  /** Shown value = SI value × scale (100 for a field entered in %). */
  scale?: number;
  hint?: ReactNode;
  readOnly?: boolean;
  testId?: string;
  className?: string;
}

/** A required value: an empty entry is refused. */
interface RequiredValue {
  optional?: false;
  value: number;
  onCommit: (value: number) => void;
}

/** An optional value: an empty entry commits `undefined` (the key is removed). */
interface OptionalValue {
  optional: true;
  value: number | undefined;
  onCommit: (value: number | undefined) => void;
}

export type EngineeringInputProps = EngineeringInputBase & (RequiredValue | OptionalValue);

/**
 * A value field in engineering notation (`4.7n`, `25k`, `1.2meg`, `4.7nF`). It commits on blur
 * or Enter and Escape reverts. A refused entry stays in the field, flagged with its reason, and
 * is never passed to `onCommit`.
 */
export function EngineeringInput(props: EngineeringInputProps) {
  const { label, unit, validate, rule = 'finite', scale = 1, hint, readOnly = false, testId, className = '' } = props;
  const id = useId();
  // The text being edited, tied to the value it started from: when the value changes under it
  // (undo, another field), the stale draft is dropped instead of overwriting the new value.
  const [draft, setDraft] = useState<{ text: string; base: number | undefined } | null>(null);
  const [error, setError] = useState<{ reason: string; base: number | undefined } | null>(null);
  const shown = props.value === undefined ? '' : formatInputValue(props.value * scale);
  const liveDraft = draft && Object.is(draft.base, props.value) ? draft.text : null;
  const liveError = error && Object.is(error.base, props.value) ? error.reason : null;

  function commit() {
    if (liveDraft === null || readOnly) return;
    const decision = decideCommit(liveDraft, shown, props.value, { unit, rule, optional: props.optional, scale }, validate);
    if (decision.kind === 'refuse') {
      setError({ reason: decision.reason, base: props.value });
      return;
    }
    setDraft(null);
    setError(null);
    if (decision.kind === 'unchanged') return;
    if (props.optional) props.onCommit(decision.value);
    else if (decision.value !== undefined) props.onCommit(decision.value);
  }

  function onKeyDown(e: KeyboardEvent<HTMLInputElement>) {
    if (e.key === 'Enter') {
      e.preventDefault();
      commit();
    } else if (e.key === 'Escape' && (liveDraft !== null || liveError !== null)) {
      e.preventDefault();
      e.stopPropagation();
      setDraft(null);
      setError(null);
    }
  }

  const hintId = hint ? `${id}-hint` : undefined;
  const errId = liveError ? `${id}-err` : undefined;
  const unitId = unit ? `${id}-unit` : undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-0.5 block text-xs font-medium text-ink-200">
        {label}
        {props.optional ? <span className="ml-1 font-normal text-ink-400">(optional)</span> : null}
      </label>
      <div
        className={`flex items-stretch overflow-hidden rounded border bg-ink-900 focus-within:outline-2 focus-within:outline-offset-1 focus-within:outline-lagoon-400 ${
          liveError ? 'border-hazard-500' : 'border-ink-600 hover:border-ink-400'
        } ${readOnly ? 'opacity-70' : ''}`}
      >
        <input
          id={id}
          type="text"
          inputMode="text"
          autoComplete="off"
          spellCheck={false}
          readOnly={readOnly}
          value={liveDraft ?? shown}
          placeholder={props.optional ? (readOnly ? '—' : 'not set') : undefined}
          title={readOnly ? undefined : `Engineering notation, e.g. 4.7n, 25k, 1.2meg, 4k7${unit ? ` (unit ${unit} optional)` : ''}; Enter applies, Esc reverts`}
          onChange={(e) => setDraft({ text: e.target.value, base: props.value })}
          onFocus={() => {
            if (!readOnly && liveDraft === null) setDraft({ text: shown, base: props.value });
          }}
          onBlur={commit}
          onKeyDown={onKeyDown}
          aria-invalid={liveError ? true : undefined}
          aria-describedby={[unitId, hintId, errId].filter(Boolean).join(' ') || undefined}
          data-testid={testId}
          className="min-w-0 flex-1 bg-transparent px-2 py-1 font-mono text-sm text-ink-50 outline-none placeholder:text-ink-400"
        />
        {unit ? (
          <span id={unitId} className="flex items-center border-l border-ink-600 bg-ink-800 px-2 font-mono text-xs text-ink-200" aria-label={`unit ${unit}`}>
            {unit}
          </span>
        ) : null}
      </div>
      {hint && !liveError ? (
        <p id={hintId} className="mt-0.5 text-[11px] text-ink-400">
          {hint}
        </p>
      ) : null}
      {liveError ? (
        <p id={errId} className="mt-0.5 text-[11px] text-hazard-100" role="alert">
          {liveError}
        </p>
      ) : null}
    </div>
  );
}
