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

/** What a field's control needs from its frame: the label's target, styling and the hint/error links. */
interface ControlProps {
  id: string;
  className: string;
  'aria-invalid'?: true;
  'aria-describedby'?: string;
}

/** Label above, hint and the server's field error below, linked to the control by aria-describedby. */
function FieldFrame({ label, error, hint, className, control: render }: FieldShell & { className: string; control: (props: ControlProps) => ReactNode }) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errId = error ? `${id}-err` : undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block text-sm font-medium text-ink-200">
        {label}
      </label>
      {render({
        id,
        className: `${control} ${borderFor(error)}`,
        'aria-invalid': error ? true : undefined,
        'aria-describedby': [hintId, errId].filter(Boolean).join(' ') || undefined,
      })}
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

/** A labelled text input with its hint and the server's field error (linked by aria-describedby). */
export function TextField({ label, error, hint, className = '', ...input }: FieldShell & InputHTMLAttributes<HTMLInputElement>) {
  return <FieldFrame label={label} error={error} hint={hint} className={className} control={(p) => <input {...p} {...input} />} />;
}

/** A labelled multi-line text box with its hint and the server's field error. */
export function TextAreaField({ label, error, hint, className = '', ...area }: FieldShell & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return <FieldFrame label={label} error={error} hint={hint} className={className} control={(p) => <textarea {...p} {...area} />} />;
}

/** A labelled select with the server's field error. */
export function SelectField({ label, error, hint, className = '', children, ...select }: FieldShell & SelectHTMLAttributes<HTMLSelectElement>) {
  return (
    <FieldFrame
      label={label}
      error={error}
      hint={hint}
      className={className}
      control={(p) => (
        <select {...p} {...select}>
          {children}
        </select>
      )}
    />
  );
}
