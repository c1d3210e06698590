'use client';
/**
 * A plain-text box that offers team members while an `@name` is typed; picking one (click,
 * Enter or Tab) writes `@Full Name` into the text. Arrow keys move through the offers, Escape
 * closes them.
 */
import { useId, useRef, useState } from 'react';
import { insertMention, mentionQuery, mentionSuggestions } from '@/lib/client/comments';

export interface MentionPerson {
  userId: string;
  name: string;
  email: string;
}

export function MentionTextarea({
  value,
  onChange,
  people,
  label,
  placeholder,
  testId,
  disabled,
  autoFocus,
  onSubmit,
}: {
  value: string;
  onChange: (v: string) => void;
  people: readonly MentionPerson[];
  label: string;
  placeholder?: string;
  testId: string;
  disabled?: boolean;
  autoFocus?: boolean;
  /** Ctrl/⌘+Enter sends. */
  onSubmit?: () => void;
}) {
  const id = useId();
  const ref = useRef<HTMLTextAreaElement>(null);
  const [caret, setCaret] = useState<number | null>(null);
  const [active, setActive] = useState(0);
  const [closedAt, setClosedAt] = useState<number | null>(null);
  const q = caret !== null ? mentionQuery(value, caret) : null;
  const offers = q && closedAt !== q.start ? mentionSuggestions(people.filter((p) => p.name.trim()), q.query) : [];
  const open = offers.length > 0;
  const current = Math.min(active, Math.max(offers.length - 1, 0));

  const choose = (name: string) => {
    if (!q || caret === null) return;
    const next = insertMention(value, q.start, caret, name);
    onChange(next.text);
    setCaret(next.caret);
    setActive(0);
    window.requestAnimationFrame(() => {
      const el = ref.current;
      if (!el) return;
      el.focus();
      el.setSelectionRange(next.caret, next.caret);
    });
  };
  const track = (el: HTMLTextAreaElement) => setCaret(el.selectionStart === el.selectionEnd ? el.selectionStart : null);

  return (
    <div className="relative">
      <label htmlFor={id} className="sr-only">
        {label}
      </label>
      <textarea
        id={id}
        ref={ref}
        value={value}
        disabled={disabled}
        autoFocus={autoFocus}
        rows={3}
        maxLength={4000}
        placeholder={placeholder}
        data-testid={testId}
        role="combobox"
        aria-expanded={open}
        aria-controls={`${id}-people`}
        aria-autocomplete="list"
        aria-activedescendant={open ? `${id}-p${current}` : undefined}
        onChange={(e) => {
          onChange(e.target.value);
          track(e.target);
          setClosedAt(null);
        }}
        onSelect={(e) => track(e.currentTarget)}
        onBlur={() => window.setTimeout(() => setCaret(null), 150)}
        onKeyDown={(e) => {
          if (open) {
            if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
              e.preventDefault();
              setActive((current + (e.key === 'ArrowDown' ? 1 : offers.length - 1)) % offers.length);
              return;
            }
            if (e.key === 'Enter' || e.key === 'Tab') {
              e.preventDefault();
              choose(offers[current].name);
              return;
            }
            if (e.key === 'Escape') {
              e.preventDefault();
              e.stopPropagation();
              setClosedAt(q?.start ?? null);
              return;
            }
          }
          if (e.key === 'Enter' && (e.ctrlKey || e.metaKey) && onSubmit) {
            e.preventDefault();
            onSubmit();
          }
        }}
        className="block w-full resize-y rounded-md border border-ink-600 bg-ink-800 px-2 py-1.5 text-sm text-ink-50 placeholder:text-ink-400"
      />
      {open ? (
        <ul id={`${id}-people`} role="listbox" aria-label="Team members" data-testid="mention-suggestions" className="absolute left-0 right-0 top-full z-20 mt-1 max-h-48 overflow-y-auto rounded-md border border-ink-600 bg-ink-900 py-1 shadow-lg">
          {offers.map((p, i) => (
            <li
              key={p.userId}
              id={`${id}-p${i}`}
              role="option"
              aria-selected={i === current}
              data-testid="mention-suggestion"
              onMouseDown={(e) => {
                e.preventDefault();
                choose(p.name);
              }}
              onMouseEnter={() => setActive(i)}
              className={`cursor-pointer px-2 py-1 text-sm ${i === current ? 'bg-lagoon-800/60 text-ink-50' : 'text-ink-200'}`}
            >
              {p.name} <span className="text-xs text-ink-400">{p.email}</span>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
