'use client';

import { useId, useState, type FormEvent, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ApiError, formError } from '@/lib/client/api';
import { formatSi } from '@/lib/client/format';
import { useCreatePart, useUpdatePart } from '@/lib/client/parts';
import { readField } from '@/lib/editor/fields';
import { DIELECTRICS, PART_KINDS, type PartDto, type PartKind } from '@/lib/parts/schema';
import { DiodeFitForm } from './diode-fit-form';
import { Modal } from './modal';
import {
  DIELECTRIC_LABEL,
  KIND_LABEL,
  PART_NUMBER_FIELDS,
  UNIT_COST_FIELD,
  emptyPartForm,
  partForm,
  readPartForm,
  serverFieldKey,
  withKind,
  type PartFormState,
  type PartNumberField,
} from './part-form-model';

/** A number field typed in engineering notation, with its unit and what it reads as. */
function SiField({ field, value, onChange, error, disabled }: { field: PartNumberField; value: string; onChange: (v: string) => void; error?: string; disabled: boolean }) {
  const id = useId();
  const read = value.trim() ? readField(value, field) : null;
  const preview = read && read.ok && read.value !== undefined && field.unit && field.unit !== '%' ? `= ${formatSi(read.value, field.unit)}` : null;
  const hint = [field.hint, preview].filter(Boolean).join(' · ');
  return (
    <div>
      <label htmlFor={id} className="mb-1 block text-sm font-medium text-ink-200">
        {field.label}
        {field.optional ? <span className="ml-1 font-normal text-ink-400">(optional)</span> : null}
      </label>
      <div className={`flex items-stretch overflow-hidden rounded-md border bg-ink-900 focus-within:outline-2 focus-within:outline-lagoon-400 ${error ? 'border-hazard-500' : 'border-ink-600 hover:border-ink-400'}`}>
        <input
          id={id}
          type="text"
          autoComplete="off"
          spellCheck={false}
          value={value}
          disabled={disabled}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-err` : hint ? `${id}-hint` : undefined}
          data-testid={`part-field-${field.key}`}
          title="Engineering notation, e.g. 4.7n, 25k, 1.2meg"
          className="min-w-0 flex-1 bg-transparent px-2.5 py-1.5 font-mono text-sm text-ink-50 outline-none"
        />
        {field.unit ? <span className="flex items-center border-l border-ink-600 bg-ink-800 px-2 font-mono text-xs text-ink-200">{field.unit}</span> : null}
      </div>
      {error ? (
        <p id={`${id}-err`} role="alert" className="mt-1 text-xs text-hazard-100">
          {error}
        </p>
      ) : hint ? (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-400">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

function Group({ title, children }: { title: string; children: ReactNode }) {
  return (
    <fieldset className="rounded-md border border-ink-600 p-3">
      <legend className="px-1 text-sm font-medium text-ink-200">{title}</legend>
      <div className="grid gap-3 sm:grid-cols-2">{children}</div>
    </fieldset>
  );
}

/**
 * Create or edit one part. Values are typed in engineering notation and checked here with the
 * server's schema before sending; what the server still refuses is shown at the field it names.
 * For a diode, the model can be fitted from two or three forward points read off the datasheet.
 */
export function PartFormDialog({ teamId, part, initialKind = 'capacitor', onClose }: { teamId: string; part: PartDto | null; initialKind?: PartKind; onClose: () => void }) {
  const [state, setState] = useState<PartFormState>(() => (part ? partForm(part) : emptyPartForm(initialKind)));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [fitOpen, setFitOpen] = useState(false);
  const create = useCreatePart(teamId);
  const update = useUpdatePart(teamId);
  const mutation = part ? update : create;
  const pending = mutation.isPending;
  const serverKey = mutation.error instanceof ApiError ? serverFieldKey(mutation.error.field, state) : null;
  const serverMessage = (key: string) => {
    if (serverKey !== key || !(mutation.error instanceof ApiError)) return undefined;
    const prefix = `${key}: `;
    return mutation.error.message.startsWith(prefix) ? mutation.error.message.slice(prefix.length) : mutation.error.message;
  };
  const err = (key: string) => errors[key] ?? serverMessage(key);
  const topError = serverKey ? undefined : formError(mutation.error);
  const set = (key: string, v: string) => setState((s) => ({ ...s, values: { ...s.values, [key]: v } }));

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const r = readPartForm(state);
    if (!r.ok) {
      setErrors(r.errors);
      return;
    }
    setErrors({});
    const done = { onSuccess: onClose };
    if (part) update.mutate({ partId: part.id, input: r.input }, done);
    else create.mutate(r.input, done);
  }

  const numberFields = PART_NUMBER_FIELDS[state.kind];
  const ratings = numberFields.filter((f) => !f.key.startsWith('specs.model.'));
  const model = numberFields.filter((f) => f.key.startsWith('specs.model.'));
  const formErrors = Object.entries(errors).filter(([k]) => !(k in state.values));

  return (
    <Modal open onClose={onClose} title={part ? `Edit ${part.partNumber}` : 'New part'} testId="part-form-dialog" wide>
      <form onSubmit={onSubmit} noValidate className="space-y-4" data-testid="part-form">
        {topError ? <Notice tone="error">{topError}</Notice> : null}
        {formErrors.length > 0 ? <Notice tone="error">{formErrors.map(([k, m]) => `${k}: ${m}`).join('; ')}</Notice> : null}
        <fieldset disabled={pending} className="space-y-4">
          <div className="grid gap-3 sm:grid-cols-3">
            <SelectField label="Kind" value={state.kind} onChange={(e) => setState((s) => withKind(s, e.target.value as PartKind))} disabled={!!part} data-testid="part-kind" hint={part ? 'A part keeps its kind; make a new part for another kind.' : undefined}>
              {PART_KINDS.map((k) => (
                <option key={k} value={k}>
                  {KIND_LABEL[k]}
                </option>
              ))}
            </SelectField>
            <TextField label="Part number" value={state.values.partNumber} onChange={(e) => set('partNumber', e.target.value)} error={err('partNumber')} maxLength={64} data-testid="part-field-partNumber" hint="The team's own number, unique in the team." />
            <TextField label="Maker" value={state.values.maker} onChange={(e) => set('maker', e.target.value)} error={err('maker')} maxLength={80} data-testid="part-field-maker" />
          </div>
          <TextField label="Description" value={state.values.description} onChange={(e) => set('description', e.target.value)} error={err('description')} maxLength={200} data-testid="part-field-description" />
          <Group title={state.kind === 'diode' ? 'Ratings' : 'Values and ratings'}>
            {ratings.map((f) => (
              <SiField key={f.key} field={f} value={state.values[f.key] ?? ''} onChange={(v) => set(f.key, v)} error={err(f.key)} disabled={pending} />
            ))}
            {state.kind === 'capacitor' ? (
              <>
                <SelectField label="Dielectric" value={state.values['specs.dielectric']} onChange={(e) => set('specs.dielectric', e.target.value)} error={err('specs.dielectric')} data-testid="part-field-specs.dielectric">
                  {DIELECTRICS.map((d) => (
                    <option key={d} value={d}>
                      {DIELECTRIC_LABEL[d]}
                    </option>
                  ))}
                </SelectField>
                <TextField label="Body size (optional)" value={state.values['specs.size']} onChange={(e) => set('specs.size', e.target.value)} error={err('specs.size')} maxLength={40} placeholder="e.g. 32 × 18 mm" />
              </>
            ) : null}
          </Group>
          {state.kind === 'diode' ? (
            <Group title="Model the solver uses (Shockley equation with series resistance)">
              {model.map((f) => (
                <SiField key={f.key} field={f} value={state.values[f.key] ?? ''} onChange={(v) => set(f.key, v)} error={err(f.key)} disabled={pending} />
              ))}
              <div className="sm:col-span-2">
                {fitOpen ? (
                  <DiodeFitForm
                    onUse={(fields) => {
                      setState((s) => ({ ...s, values: { ...s.values, ...fields } }));
                      setFitOpen(false);
                    }}
                    onCancel={() => setFitOpen(false)}
                  />
                ) : (
                  <Button variant="secondary" onClick={() => setFitOpen(true)} data-testid="open-diode-fit">
                    Fit IS, N, RS from the datasheet curve…
                  </Button>
                )}
              </div>
            </Group>
          ) : null}
          <div className="grid gap-3 sm:grid-cols-3">
            <SiField field={UNIT_COST_FIELD} value={state.values.unitCost ?? ''} onChange={(v) => set('unitCost', v)} error={err('unitCost')} disabled={pending} />
            <TextField label="Currency" value={state.values.currency} onChange={(e) => set('currency', e.target.value.toUpperCase())} error={err('currency')} maxLength={3} hint="three letters, e.g. EUR" />
          </div>
        </fieldset>
        <div className="flex justify-end gap-2">
          <Button variant="ghost" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" pending={pending} pendingLabel="Saving…" data-testid="part-form-submit">
            {part ? 'Save part' : 'Add part'}
          </Button>
        </div>
      </form>
    </Modal>
  );
}
