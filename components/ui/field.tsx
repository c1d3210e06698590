import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

const control =
  'block w-full rounded-md border bg-ink-900 px-2.5 py-1.5 text-sm text-ink-50 placeholder:text-ink-400 disabled:opacity-60';

function borderFor(error?: string) {
  return error ? 'border-hazard-500' : 'border-ink-600 hover:border-ink-400';
}

interface FieldShell {
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
}

/** A labelled text input with its hint and the server's field error (linked by aria-describedby). */
export function TextField({ label, error, hint, className = '', ...input }: FieldShell & InputHTMLAttributes<HTMLInputElement>) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errId = error ? `${id}-err` : undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block text-sm font-medium text-ink-200">
        {label}
      </label>
      <input
        id={id}
        className={`${control} ${borderFor(error)}`}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hintId, errId].filter(Boolean).join(' ') || undefined}
        {...input}
      />
      {hint ? (
        <p id={hintId} className="mt-1 text-xs text-ink-400">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errId} className="mt-1 text-xs text-hazard-100" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A labelled multi-line text box with its hint and the server's field error. */
export function TextAreaField({ label, error, hint, className = '', ...area }: FieldShell & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errId = error ? `${id}-err` : undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block text-sm font-medium text-ink-200">
        {label}
      </label>
      <textarea
        id={id}
        className={`${control} ${borderFor(error)}`}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hintId, errId].filter(Boolean).join(' ') || undefined}
        {...area}
      />
      {hint ? (
        <p id={hintId} className="mt-1 text-xs text-ink-400">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errId} className="mt-1 text-xs text-hazard-100" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A labelled select with the server's field error. */
export function SelectField({ label, error, hint, className = '', children, ...select }: FieldShell & SelectHTMLAttributes<HTMLSelectElement>) {
  const id = useId();
  const errId = error ? `${id}-err` : undefined;
  const hintId = hint ? `${id}-hint` : undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block text-sm font-medium text-ink-200">
        {label}
      </label>
      <select
        id={id}
        className={`${control} ${borderFor(error)}`}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hintId, errId].filter(Boolean).join(' ') || undefined}
        {...select}
      >
        {children}
      </select>
      {hint ? (
        <p id={hintId} className="mt-1 text-xs text-ink-400">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errId} className="mt-1 text-xs text-hazard-100" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}
