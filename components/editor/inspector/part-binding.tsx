'use client';

import { useId, useState } from 'react';
import type { CapacitorSpec, DiodeSpec } from '@/lib/circuit';
import { formatInputValue } from '@/lib/editor/format';
import { bindSpec, bindingDrift, unbind, type AnyPart, type ResistorSpec } from '@/lib/parts/binding';
import type { PartDto, PartKind } from '@/lib/parts/schema';
import { useEditorParts } from '@/components/parts/editor-parts-context';
import { filterParts, keyValue, partSummary, ratingsText } from '@/components/parts/part-form-model';

type Spec = CapacitorSpec | DiodeSpec | ResistorSpec;

const KIND_WORD: Record<PartKind, string> = { capacitor: 'capacitor', diode: 'diode', resistor: 'resistor' };

function driftValue(v: number | undefined): string {
  return v === undefined ? 'not set' : formatInputValue(v, 4);
}

/** Searchable list of the team's parts of one kind; a click binds. */
function PartPicker({ kind, parts, onPick, onCancel, testId }: { kind: PartKind; parts: PartDto[]; onPick: (p: PartDto) => void; onCancel: () => void; testId: string }) {
  const [q, setQ] = useState('');
  const id = useId();
  const shown = filterParts(parts, kind, q);
  return (
    <div className="space-y-1.5 rounded border border-lagoon-600 bg-ink-900 p-2" data-testid={`${testId}-picker`}>
      <label htmlFor={id} className="block text-[11px] font-medium text-ink-200">
        Library {KIND_WORD[kind]}s
      </label>
      <input
        id={id}
        type="search"
        autoFocus
        value={q}
        onChange={(e) => setQ(e.target.value)}
        onKeyDown={(e) => {
          if (e.key === 'Escape') {
            e.stopPropagation();
            onCancel();
          }
        }}
        placeholder="Part number, maker…"
        className="block w-full rounded border border-ink-600 bg-ink-800 px-2 py-1 text-xs text-ink-50 placeholder:text-ink-400"
        data-testid={`${testId}-picker-search`}
      />
      <ul className="max-h-48 space-y-0.5 overflow-y-auto" role="listbox" aria-label={`Library ${KIND_WORD[kind]}s`}>
        {shown.length === 0 ? <li className="px-1 py-1 text-[11px] text-ink-400">No library {KIND_WORD[kind]} matches.</li> : null}
        {shown.map((p) => (
          <li key={p.id}>
            <button
              type="button"
              role="option"
              aria-selected={false}
              onClick={() => onPick(p)}
              className="w-full rounded px-1.5 py-1 text-left text-xs hover:bg-ink-800"
              data-testid="library-part-option"
              data-part-number={p.partNumber}
              title={partSummary(p)}
            >
              <span className="font-mono text-ink-50">{p.partNumber}</span>
              <span className="ml-1.5 text-ink-200">{keyValue(p)}</span>
              <span className="ml-1.5 text-ink-400">{ratingsText(p)}</span>
            </button>
          </li>
        ))}
      </ul>
      <button type="button" onClick={onCancel} className="rounded px-1.5 py-0.5 text-[11px] text-ink-200 hover:bg-ink-800">
        Cancel
      </button>
    </div>
  );
}

/**
 * Which team library part this design part is, and the controls to bind, refresh and unbind it.
 * Binding copies the library values into the design (one undo step); the inspector warns when
 * the library part has changed since. A hand edit of a copied value unbinds (the form does that).
 * Outside an editor with a library (`useEditorParts()` null) it shows the reference only.
 */
export function PartBinding({ kind, spec, onChange, readOnly, testId }: { kind: PartKind; spec: Spec; onChange: (next: Spec) => void; readOnly: boolean; testId: string }) {
  const lib = useEditorParts();
  const [picking, setPicking] = useState(false);
  const partId = spec.partId ?? null;
  const part = partId && lib ? lib.byId.get(partId) : undefined;
  const drift = part && part.kind === kind ? bindingDrift(spec, part as AnyPart) : [];
  const bind = (p: PartDto) => {
    setPicking(false);
    onChange(bindSpec(kind, spec, p as AnyPart));
  };

  return (
    <div className="space-y-1.5 rounded border border-ink-800 bg-ink-900/60 px-2 py-1.5 text-xs" data-testid={`${testId}-binding`} data-part-id={partId ?? ''} data-bound-part-number={part?.partNumber ?? ''} data-drift={drift.length > 0 ? 'true' : 'false'}>
      <div className="flex flex-wrap items-baseline gap-x-2 gap-y-1">
        <span className="text-ink-400">Library part</span>
        {part ? (
          <span className="font-mono font-semibold text-copper-100" data-testid={`${testId}-bound-part`}>
            {part.partNumber}
          </span>
        ) : partId ? (
          <span className="font-mono text-ink-200" title={partId}>
            {lib && !lib.loading ? 'not in the team library' : partId}
          </span>
        ) : (
          <span className="text-ink-400">none (values typed here)</span>
        )}
        {!readOnly && lib?.parts ? (
          <span className="ml-auto flex gap-1">
            <button type="button" onClick={() => setPicking((v) => !v)} className="rounded border border-ink-600 px-1.5 py-0.5 text-ink-100 hover:border-lagoon-400" data-testid={`${testId}-use-library`}>
              {partId ? 'Change…' : 'Use library part…'}
            </button>
            {partId ? (
              <button type="button" onClick={() => onChange(unbind(spec))} className="rounded px-1.5 py-0.5 text-ink-200 hover:bg-ink-800" data-testid={`${testId}-unbind`}>
                Unbind
              </button>
            ) : null}
          </span>
        ) : null}
      </div>
      {partId && !part && lib && !lib.loading ? (
        <p className="text-[11px] text-ink-400">The reference {partId} is not a part of this team&apos;s library (deleted, or typed by hand). The values here are the design&apos;s own.</p>
      ) : null}
      {drift.length > 0 && part ? (
        <div role="status" className="rounded border border-copper-600 bg-copper-800/30 px-2 py-1 text-copper-100" data-testid={`${testId}-drift`}>
          <p className="font-semibold">Library part changed — refresh values</p>
          <ul className="mt-0.5 list-disc pl-4 text-[11px]">
            {drift.map((d) => (
              <li key={d.path}>
                {d.label}: design {driftValue(d.design)}, library {driftValue(d.library)}
              </li>
            ))}
          </ul>
          {!readOnly ? (
            <button type="button" onClick={() => bind(part)} className="mt-1 rounded bg-copper-600 px-1.5 py-0.5 text-ink-900 hover:bg-copper-400" data-testid={`${testId}-refresh`}>
              Refresh values from {part.partNumber}
            </button>
          ) : null}
        </div>
      ) : null}
      {part && !readOnly ? <p className="text-[11px] text-ink-400">Values below are copied from the library. Editing one by hand unbinds the part.</p> : null}
      {picking && lib?.parts ? <PartPicker kind={kind} parts={lib.parts} onPick={bind} onCancel={() => setPicking(false)} testId={testId} /> : null}
      {lib?.error && !lib.parts ? <p className="text-[11px] text-hazard-100">The team library could not be read.</p> : null}
    </div>
  );
}
