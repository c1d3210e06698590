'use client';

import { useId } from 'react';

/**
 * A small set of exclusive choices (variant, polarity, load mode) as a radio group drawn as
 * joined buttons: arrow keys move between them, as for any radio group.
 */
export function ChoiceField<T extends string>({
  label,
  value,
  options,
  onChange,
  readOnly = false,
  testId,
}: {
  label: string;
  value: T;
  options: ReadonlyArray<{ value: T; label: string }>;
  onChange: (value: T) => void;
  readOnly?: boolean;
  testId?: string;
}) {
  const name = useId();
  return (
    <fieldset data-testid={testId} disabled={readOnly} className="min-w-0">
      <legend className="mb-0.5 text-xs font-medium text-ink-200">{label}</legend>
      <div className="inline-flex overflow-hidden rounded border border-ink-600">
        {options.map((o) => (
          <label
            key={o.value}
            className={`cursor-pointer border-r border-ink-600 px-2.5 py-1 text-xs last:border-r-0 has-[:focus-visible]:outline-2 has-[:focus-visible]:-outline-offset-2 has-[:focus-visible]:outline-lagoon-400 has-[:disabled]:cursor-not-allowed ${
              value === o.value ? 'bg-copper-800/60 font-semibold text-copper-100' : 'bg-ink-900 text-ink-200 hover:bg-ink-800'
            }`}
          >
            <input
              type="radio"
              className="sr-only"
              name={name}
              value={o.value}
              checked={value === o.value}
              onChange={() => onChange(o.value)}
            />
            {o.label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}
