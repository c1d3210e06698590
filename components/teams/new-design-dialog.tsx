'use client';

import { useRouter } from 'next/navigation';
import { useId, useRef, useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import type { Visibility } from '@/lib/api/contract';
import { DOCUMENT_SCHEMA_VERSION, type DesignDocument } from '@/lib/circuit/document/schema';
import { fullWaveStarter, halfWaveStarter, symmetricStarter, type StarterOptions } from '@/lib/circuit/document/starters';
import { parseEngineering } from '@/lib/circuit/netlist/units';
import { ApiError, formError } from '@/lib/client/api';
import { formatSi } from '@/lib/client/format';
import { useCreateDesign } from '@/lib/client/hooks';

type Starter = 'half-wave' | 'full-wave' | 'symmetric' | 'blank';

const STARTERS: { value: Starter; label: string; note: string }[] = [
  { value: 'half-wave', label: 'Half-wave ladder', note: 'One drive, one pumping and one smoothing column.' },
  { value: 'full-wave', label: 'Full-wave ladder', note: 'Centre-tapped drive, two pumping columns in antiphase.' },
  { value: 'symmetric', label: 'Symmetric pair', note: 'A positive and a negative ladder about ground.' },
  { value: 'blank', label: 'Empty canvas', note: 'Nothing drawn: build the circuit from the tray.' },
];

/** An empty drawing with the default settings (derating 0.8, no strays, no bleeder). */
function blankDocument(): DesignDocument {
  return { schemaVersion: DOCUMENT_SCHEMA_VERSION, blocks: [], wires: [], settings: { strayCapacitanceF: 0, deratingFraction: 0.8 } };
}

const MAX_STAGES = 50;

interface Values {
  title: string;
  starter: Starter;
  stages: string;
  polarity: 'positive' | 'negative';
  amplitude: string;
  frequency: string;
  capacitance: string;
  loadCurrent: string;
  visibility: Visibility;
}

type FieldKey = 'title' | 'stages' | 'amplitude' | 'frequency' | 'capacitance' | 'loadCurrent';
type Errors = Partial<Record<FieldKey, string>>;

function build(v: Values): { ok: true; document: DesignDocument } | { ok: false; errors: Errors } {
  const errors: Errors = {};
  if (!v.title.trim()) errors.title = 'Give the design a title.';
  if (v.starter === 'blank') return Object.keys(errors).length > 0 ? { ok: false, errors } : { ok: true, document: blankDocument() };
  const n = Number(v.stages);
  if (!Number.isInteger(n) || n < 1 || n > MAX_STAGES) errors.stages = `Whole number from 1 to ${MAX_STAGES}.`;
  const amplitudeV = parseEngineering(v.amplitude);
  if (amplitudeV === null || amplitudeV <= 0) errors.amplitude = 'A positive voltage, e.g. 2.5k or 2500.';
  const frequencyHz = parseEngineering(v.frequency);
  if (frequencyHz === null || frequencyHz <= 0) errors.frequency = 'A positive frequency, e.g. 50 or 20k.';
  const capacitanceF = parseEngineering(v.capacitance);
  if (capacitanceF === null || capacitanceF <= 0) errors.capacitance = 'A positive capacitance, e.g. 10n or 1u.';
  let loadCurrentA: number | undefined;
  if (v.loadCurrent.trim()) {
    const i = parseEngineering(v.loadCurrent);
    if (i === null || i < 0) errors.loadCurrent = 'A current of zero or more, e.g. 1m.';
    else loadCurrentA = i;
  }
  if (Object.keys(errors).length > 0 || amplitudeV === null || frequencyHz === null || capacitanceF === null) return { ok: false, errors };
  const o: StarterOptions = { amplitudeV, amplitudeMode: 'peak', frequencyHz, capacitanceF, loadCurrentA, polarity: v.polarity };
  const document = v.starter === 'half-wave' ? halfWaveStarter(n, o) : v.starter === 'full-wave' ? fullWaveStarter(n, o) : symmetricStarter(n, o);
  return { ok: true, document };
}

/** Which of our inputs a server-side field path (e.g. `document.blocks.0.data.frequencyHz`) belongs to. */
function inputForServerField(field: string | undefined): FieldKey | null {
  if (!field) return null;
  if (field === 'title') return 'title';
  if (field.endsWith('amplitudeV')) return 'amplitude';
  if (field.endsWith('frequencyHz')) return 'frequency';
  if (field.endsWith('capacitanceF')) return 'capacitance';
  if (field.endsWith('currentA')) return 'loadCurrent';
  return null;
}

function preview(text: string, unit: string): string | undefined {
  const v = parseEngineering(text);
  return v === null ? undefined : `= ${formatSi(v, unit)}`;
}

/** "New design" button and its dialog: pick a starter ladder and its main values; the document is built here and POSTed. */
export function NewDesignDialog({ teamId }: { teamId: string }) {
  const router = useRouter();
  const dialogRef = useRef<HTMLDialogElement>(null);
  const headingId = useId();
  const create = useCreateDesign(teamId);
  const [values, setValues] = useState<Values>({
    title: '',
    starter: 'half-wave',
    stages: '4',
    polarity: 'positive',
    amplitude: '2.5k',
    frequency: '20k',
    capacitance: '10n',
    loadCurrent: '',
    visibility: 'team',
  });
  const [errors, setErrors] = useState<Errors>({});

  const set = <K extends keyof Values>(k: K, v: Values[K]) => setValues((s) => ({ ...s, [k]: v }));

  function open() {
    create.reset();
    setErrors({});
    dialogRef.current?.showModal();
  }

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const built = build(values);
    if (!built.ok) {
      setErrors(built.errors);
      return;
    }
    setErrors({});
    create.mutate(
      { title: values.title.trim(), visibility: values.visibility, document: built.document, message: values.starter === 'blank' ? 'Started from an empty canvas' : `Started from a ${values.starter} ladder` },
      {
        onSuccess: (res) => {
          dialogRef.current?.close();
          router.push(`/designs/${res.design.id}`);
        },
      },
    );
  }

  const serverField = create.error instanceof ApiError ? inputForServerField(create.error.field) : null;
  const err = (k: FieldKey) => errors[k] ?? (serverField === k ? create.error?.message : undefined);
  const topError = serverField ? undefined : formError(create.error);
  const pending = create.isPending;

  return (
    <>
      <Button onClick={open} data-testid="new-design">
        New design
      </Button>
      <dialog
        ref={dialogRef}
        aria-labelledby={headingId}
        className="m-auto w-full max-w-2xl rounded-lg border border-ink-600 bg-ink-800 p-0 text-ink-100 shadow-2xl"
        data-testid="new-design-dialog"
      >
        <form onSubmit={onSubmit} className="space-y-4 p-6" noValidate>
          <div className="flex items-start justify-between gap-4">
            <h2 id={headingId} className="text-lg font-semibold text-ink-50">
              New design
            </h2>
            <Button variant="ghost" onClick={() => dialogRef.current?.close()} aria-label="Close">
              ✕
            </Button>
          </div>
          {topError ? <Notice tone="error">{topError}</Notice> : null}
          <TextField label="Title" name="title" required maxLength={120} value={values.title} onChange={(e) => set('title', e.target.value)} error={err('title')} disabled={pending} autoFocus />

          <fieldset disabled={pending}>
            <legend className="mb-1 text-sm font-medium text-ink-200">Topology</legend>
            <div className="grid gap-2 sm:grid-cols-2">
              {STARTERS.map((s) => (
                <label
                  key={s.value}
                  className={`cursor-pointer rounded-md border p-3 text-sm has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-lagoon-400 ${
                    values.starter === s.value ? 'border-copper-400 bg-copper-800/30' : 'border-ink-600 hover:border-ink-400'
                  }`}
                >
                  <input type="radio" name="starter" value={s.value} checked={values.starter === s.value} onChange={() => set('starter', s.value)} className="sr-only" data-testid={`starter-${s.value}`} />
                  <span className="block font-medium text-ink-50">{s.label}</span>
                  <span className="text-xs text-ink-400">{s.note}</span>
                </label>
              ))}
            </div>
          </fieldset>

          <fieldset disabled={pending || values.starter === 'blank'} className="space-y-4 disabled:opacity-50" data-testid="starter-values">
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Stages" name="stages" type="number" inputMode="numeric" min={1} max={MAX_STAGES} step={1} value={values.stages} onChange={(e) => set('stages', e.target.value)} error={err('stages')} disabled={pending} />
            <SelectField
              label="Output polarity"
              name="polarity"
              value={values.starter === 'symmetric' ? 'both' : values.polarity}
              onChange={(e) => set('polarity', e.target.value === 'negative' ? 'negative' : 'positive')}
              disabled={pending || values.starter === 'symmetric'}
              hint={values.starter === 'symmetric' ? 'A symmetric pair has both.' : undefined}
            >
              {values.starter === 'symmetric' ? <option value="both">Both (±)</option> : null}
              <option value="positive">Positive</option>
              <option value="negative">Negative</option>
            </SelectField>
          </div>

          <div className="grid gap-4 sm:grid-cols-2">
            <TextField
              label={<span>Drive amplitude, peak (V) <span className="text-copper-400">live</span></span>}
              name="amplitude"
              value={values.amplitude}
              onChange={(e) => set('amplitude', e.target.value)}
              error={err('amplitude')}
              hint={preview(values.amplitude, 'V') ?? 'Peak of the sine drive; 2.5k = 2500 V.'}
              disabled={pending}
              autoComplete="off"
            />
            <TextField label="Frequency (Hz)" name="frequency" value={values.frequency} onChange={(e) => set('frequency', e.target.value)} error={err('frequency')} hint={preview(values.frequency, 'Hz') ?? 'e.g. 50, 20k'} disabled={pending} autoComplete="off" />
            <TextField label="Stage capacitance (F)" name="capacitance" value={values.capacitance} onChange={(e) => set('capacitance', e.target.value)} error={err('capacitance')} hint={preview(values.capacitance, 'F') ?? 'Each stage capacitor; e.g. 10n, 1u'} disabled={pending} autoComplete="off" />
            <TextField label="Load current (A), optional" name="loadCurrent" value={values.loadCurrent} onChange={(e) => set('loadCurrent', e.target.value)} error={err('loadCurrent')} hint={preview(values.loadCurrent, 'A') ?? 'Blank = no load; e.g. 1m'} disabled={pending} autoComplete="off" />
          </div>
          <p className="text-xs text-ink-400">Values take SPICE suffixes: f p n u m k meg g t (note: m is milli, meg is mega).</p>
          </fieldset>
          <div className="grid gap-4 sm:grid-cols-3">
            <SelectField label="Visibility" name="visibility" value={values.visibility} onChange={(e) => set('visibility', e.target.value === 'private' ? 'private' : 'team')} disabled={pending}>
              <option value="team">Shared with the team</option>
              <option value="private">Private to me</option>
            </SelectField>
          </div>

          <div className="flex justify-end gap-2">
            <Button variant="ghost" onClick={() => dialogRef.current?.close()} disabled={pending}>
              Cancel
            </Button>
            <Button type="submit" pending={pending} pendingLabel="Creating…" data-testid="new-design-submit">
              Create design
            </Button>
          </div>
        </form>
      </dialog>
    </>
  );
}
