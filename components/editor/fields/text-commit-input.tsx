'use client';

import { useId, useState, type ReactNode } from 'react';

/**
 * A short text field (block label, part id) that commits on blur or Enter, reverts on Escape,
 * and refuses an entry `read` rejects, showing the reason.
 */
export function TextCommitInput({
  label,
  value,
  onCommit,
  read,
  readOnly = false,
  placeholder,
  testId,
  className = '',
}: {
  label: ReactNode;
  value: string | undefined;
  onCommit: (value: string | undefined) => void;
  read: (text: string) => { ok: true; value: string | undefined } | { ok: false; reason: string };
  readOnly?: boolean;
  placeholder?: string;
  testId?: string;
  className?: string;
}) {
  const id = useId();
  const [draft, setDraft] = useState<{ text: string; base: string | undefined } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const live = draft && draft.base === value ? draft.text : null;
  const liveError = live !== null ? error : null;

  function commit() {
    if (live === null || readOnly) return;
    const r = read(live);
    if (!r.ok) {
      setError(r.reason);
      return;
    }
    setDraft(null);
    setError(null);
    if (r.value !== value) onCommit(r.value);
  }

  const errId = liveError ? `${id}-err` : undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-0.5 block text-xs font-medium text-ink-200">
        {label}
      </label>
      <input
        id={id}
        type="text"
        autoComplete="off"
        readOnly={readOnly}
        value={live ?? value ?? ''}
        placeholder={placeholder}
        onChange={(e) => setDraft({ text: e.target.value, base: value })}
        onBlur={commit}
        onKeyDown={(e) => {
          if (e.key === 'Enter') {
            e.preventDefault();
            commit();
          } else if (e.key === 'Escape' && live !== null) {
            e.preventDefault();
            e.stopPropagation();
            setDraft(null);
            setError(null);
          }
        }}
        aria-invalid={liveError ? true : undefined}
        aria-describedby={errId}
        data-testid={testId}
        className={`block w-full rounded border bg-ink-900 px-2 py-1 text-sm text-ink-50 placeholder:text-ink-400 ${
          liveError ? 'border-hazard-500' : 'border-ink-600 hover:border-ink-400'
        } ${readOnly ? 'opacity-70' : ''}`}
      />
      {liveError ? (
        <p id={errId} className="mt-0.5 text-[11px] text-hazard-100" role="alert">
          {liveError}
        </p>
      ) : null}
    </div>
  );
}
