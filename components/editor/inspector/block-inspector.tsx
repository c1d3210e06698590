'use client';

import type { ReactNode } from 'react';
import { portsOf, type CapacitorSpec, type DesignBlock, type DiodeSpec } from '@/lib/circuit';
import { ChoiceField } from '@/components/editor/fields/choice-field';
import { EngineeringInput } from '@/components/editor/fields/engineering-input';
import { SpecFields } from '@/components/editor/fields/spec-fields';
import { TextCommitInput } from '@/components/editor/fields/text-commit-input';
import {
  AC_SOURCE_FIELDS,
  CAPACITOR_FIELDS,
  DC_SOURCE_FIELDS,
  DIODE_FIELDS,
  LOAD_FIELDS,
  MAX_PART_ID_LENGTH,
  RESISTOR_FIELDS,
  drivePeakV,
  readLabel,
  setAmplitudeMode,
  setLoadMode,
  setStageVariant,
  withLabel,
  withPartId,
} from '@/lib/editor/fields';
import { formatReading } from '@/lib/editor/format';
import { keepBindingAfterEdit } from '@/lib/parts/binding';
import { useEditorParts } from '@/components/parts/editor-parts-context';
import { PartBinding } from './part-binding';

const KIND_TITLE: Record<DesignBlock['kind'], string> = {
  acSource: 'AC drive',
  dcSource: 'DC source',
  stage: 'Ladder stage',
  load: 'Load',
  ground: 'Ground',
  capacitor: 'Capacitor',
  diode: 'Diode',
  resistor: 'Resistor',
};

/** Where each stage part sits, in the schema's port names (see lib/circuit/document/schema.ts). */
const STAGE_PART_PLACE = {
  pumpC: 'xIn → xOut, pumping column',
  smoothC: 'yIn → yOut, smoothing column',
  pump2C: 'x2In → x2Out, antiphase pumping column',
  diodeA: 'yIn → xOut',
  diodeB: 'xOut → yOut',
  diodeC: 'yIn → x2Out',
  diodeD: 'x2Out → yOut',
} as const;

function readPartId(text: string) {
  return readLabel(text, MAX_PART_ID_LENGTH);
}

function PartGroup({ title, place, open, children, testId }: { title: string; place?: string; open?: boolean; children: ReactNode; testId?: string }) {
  return (
    <details open={open} className="group rounded border border-ink-800 bg-ink-900/40" data-testid={testId}>
      <summary className="flex cursor-pointer select-none items-baseline gap-2 px-2 py-1.5 text-xs font-semibold text-ink-100 marker:text-ink-400">
        {title}
        {place ? <span className="font-mono text-[11px] font-normal text-ink-400">{place}</span> : null}
      </summary>
      <div className="space-y-2 px-2 pb-2">{children}</div>
    </details>
  );
}

function CapacitorForm({ spec, onChange, readOnly, testId }: { spec: CapacitorSpec; onChange: (s: CapacitorSpec) => void; readOnly: boolean; testId: string }) {
  const library = useEditorParts() !== null;
  return (
    <>
      {library ? <PartBinding kind="capacitor" spec={spec} onChange={(s) => onChange(s as CapacitorSpec)} readOnly={readOnly} testId={testId} /> : null}
      <SpecFields specs={CAPACITOR_FIELDS} value={spec} onChange={(next) => onChange(keepBindingAfterEdit('capacitor', spec, next))} readOnly={readOnly} testIdPrefix={testId} />
      {library ? null : <PartIdField value={spec.partId} readOnly={readOnly} onCommit={(partId) => onChange(withPartId(spec, partId))} />}
    </>
  );
}

function DiodeForm({ spec, onChange, readOnly, testId }: { spec: DiodeSpec; onChange: (s: DiodeSpec) => void; readOnly: boolean; testId: string }) {
  const library = useEditorParts() !== null;
  return (
    <>
      <p className="text-[11px] text-ink-400">Shockley diode equation with series resistance; ratings are the part&apos;s limits.</p>
      {library ? <PartBinding kind="diode" spec={spec} onChange={(s) => onChange(s as DiodeSpec)} readOnly={readOnly} testId={testId} /> : null}
      <SpecFields specs={DIODE_FIELDS} value={spec} onChange={(next) => onChange(keepBindingAfterEdit('diode', spec, next))} readOnly={readOnly} testIdPrefix={testId} />
      {library ? null : <PartIdField value={spec.partId} readOnly={readOnly} onCommit={(partId) => onChange(withPartId(spec, partId))} />}
    </>
  );
}

function ResistorForm({ block, onChange, readOnly }: { block: Of<'resistor'>; onChange: (b: DesignBlock) => void; readOnly: boolean }) {
  const library = useEditorParts() !== null;
  const spec = block.data;
  return (
    <>
      {library ? <PartBinding kind="resistor" spec={spec} onChange={(data) => onChange({ ...block, data: data as typeof spec })} readOnly={readOnly} testId="field" /> : null}
      <SpecFields specs={RESISTOR_FIELDS} value={spec} onChange={(data) => onChange({ ...block, data: keepBindingAfterEdit('resistor', spec, data) })} readOnly={readOnly} testIdPrefix="field" />
      {library ? null : <PartIdField value={spec.partId} readOnly={readOnly} onCommit={(partId) => onChange({ ...block, data: withPartId(spec, partId) })} />}
    </>
  );
}

function PartIdField({ value, onCommit, readOnly }: { value: string | null | undefined; onCommit: (v: string | undefined) => void; readOnly: boolean }) {
  return <TextCommitInput label="Part reference (optional)" value={value ?? undefined} onCommit={onCommit} read={readPartId} readOnly={readOnly} placeholder={readOnly ? undefined : 'e.g. a catalogue id'} />;
}

type Of<K extends DesignBlock['kind']> = Extract<DesignBlock, { kind: K }>;

function StageForm({ block, onChange, readOnly }: { block: Of<'stage'>; onChange: (b: DesignBlock) => void; readOnly: boolean }) {
  const d = block.data;
  const set = <K extends keyof typeof d>(key: K, v: (typeof d)[K]) => onChange({ ...block, data: { ...d, [key]: v } });
  const full = d.variant === 'full';
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-3">
        <ChoiceField
          label="Drive"
          value={d.variant}
          options={[
            { value: 'half', label: 'Half-wave' },
            { value: 'full', label: 'Full-wave' },
          ]}
          onChange={(v) => onChange(setStageVariant(block, v))}
          readOnly={readOnly}
          testId="inspector-stage-variant"
        />
        <ChoiceField
          label="Polarity"
          value={d.polarity}
          options={[
            { value: 'positive', label: 'Positive' },
            { value: 'negative', label: 'Negative' },
          ]}
          onChange={(v) => set('polarity', v)}
          readOnly={readOnly}
          testId="inspector-stage-polarity"
        />
      </div>
      <PartGroup title="Pumping C" place={STAGE_PART_PLACE.pumpC} open testId="inspector-pumpC">
        <CapacitorForm spec={d.pumpC} onChange={(s) => set('pumpC', s)} readOnly={readOnly} testId="field-pumpC" />
      </PartGroup>
      {full && d.pump2C ? (
        <PartGroup title="Second pumping C" place={STAGE_PART_PLACE.pump2C} open testId="inspector-pump2C">
          <CapacitorForm spec={d.pump2C} onChange={(s) => set('pump2C', s)} readOnly={readOnly} testId="field-pump2C" />
        </PartGroup>
      ) : null}
      <PartGroup title="Smoothing C" place={STAGE_PART_PLACE.smoothC} open testId="inspector-smoothC">
        <CapacitorForm spec={d.smoothC} onChange={(s) => set('smoothC', s)} readOnly={readOnly} testId="field-smoothC" />
      </PartGroup>
      {(['diodeA', 'diodeB', ...(full ? (['diodeC', 'diodeD'] as const) : [])] as const).map((role) => {
        const spec = d[role];
        if (!spec) return null;
        return (
          <PartGroup key={role} title={`Diode ${role.slice(-1)}`} place={polarityPlace(STAGE_PART_PLACE[role], d.polarity)} testId={`inspector-${role}`}>
            <DiodeForm spec={spec} onChange={(s) => set(role, s)} readOnly={readOnly} testId={`field-${role}`} />
          </PartGroup>
        );
      })}
    </div>
  );
}

/** Anode → cathode for a positive stage; a negative stage reverses its diodes. */
function polarityPlace(place: string, polarity: 'positive' | 'negative'): string {
  const [from, to] = place.split(' → ');
  return polarity === 'positive' ? `anode ${from} → cathode ${to}` : `anode ${to} → cathode ${from}`;
}

function AcSourceForm({ block, onChange, readOnly }: { block: Of<'acSource'>; onChange: (b: DesignBlock) => void; readOnly: boolean }) {
  const d = block.data;
  const peak = drivePeakV(d);
  const [amplitude, ...rest] = AC_SOURCE_FIELDS;
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-3">
        <ChoiceField
          label="Winding"
          value={d.variant}
          options={[
            { value: 'single', label: 'Single' },
            { value: 'centreTapped', label: 'Centre-tapped' },
          ]}
          onChange={(v) => onChange({ ...block, data: { ...d, variant: v } })}
          readOnly={readOnly}
          testId="inspector-source-variant"
        />
        <ChoiceField
          label="Amplitude is"
          value={d.amplitudeMode}
          options={[
            { value: 'peak', label: 'Peak' },
            { value: 'rms', label: 'RMS' },
          ]}
          onChange={(v) => onChange(setAmplitudeMode(block, v))}
          readOnly={readOnly}
          testId="inspector-amplitude-mode"
        />
      </div>
      <div className="grid grid-cols-2 gap-x-3 gap-y-2">
        <EngineeringInput
          label={`${amplitude.label} (${d.amplitudeMode === 'rms' ? 'RMS' : 'peak'}${d.variant === 'centreTapped' ? ', each leg' : ''})`}
          unit={amplitude.unit}
          rule={amplitude.rule}
          value={d.amplitudeV}
          onCommit={(v) => onChange({ ...block, data: { ...d, amplitudeV: v } })}
          readOnly={readOnly}
          hint={d.amplitudeMode === 'rms' ? `peak ${formatReading(peak, 'V')}` : `RMS ${formatReading(peak / Math.SQRT2, 'V')}`}
          testId="field-amplitudeV"
        />
      </div>
      <SpecFields specs={rest} value={d} onChange={(data) => onChange({ ...block, data })} readOnly={readOnly} testIdPrefix="field" />
    </div>
  );
}

function LoadForm({ block, onChange, readOnly }: { block: Of<'load'>; onChange: (b: DesignBlock) => void; readOnly: boolean }) {
  const d = block.data;
  return (
    <div className="space-y-2">
      <ChoiceField
        label="Load is"
        value={d.mode}
        options={[
          { value: 'resistor', label: 'Resistor' },
          { value: 'current', label: 'Constant current' },
        ]}
        onChange={(v) => onChange(setLoadMode(block, v))}
        readOnly={readOnly}
        testId="inspector-load-mode"
      />
      {d.mode === 'resistor' ? (
        <SpecFields specs={[LOAD_FIELDS.resistor]} value={d} onChange={(data) => onChange({ ...block, data })} readOnly={readOnly} testIdPrefix="field" />
      ) : (
        <SpecFields specs={[LOAD_FIELDS.current]} value={d} onChange={(data) => onChange({ ...block, data })} readOnly={readOnly} testIdPrefix="field" />
      )}
      <p className="text-[11px] text-ink-400">Current is drawn from port a and returned at port b.</p>
    </div>
  );
}

function KindForm({ block, onChange, readOnly }: { block: DesignBlock; onChange: (b: DesignBlock) => void; readOnly: boolean }) {
  switch (block.kind) {
    case 'acSource':
      return <AcSourceForm block={block} onChange={onChange} readOnly={readOnly} />;
    case 'dcSource':
      return <SpecFields specs={DC_SOURCE_FIELDS} value={block.data} onChange={(data) => onChange({ ...block, data })} readOnly={readOnly} testIdPrefix="field" />;
    case 'stage':
      return <StageForm block={block} onChange={onChange} readOnly={readOnly} />;
    case 'load':
      return <LoadForm block={block} onChange={onChange} readOnly={readOnly} />;
    case 'ground':
      return <p className="text-xs text-ink-400">The reference node: every reading is to this point.</p>;
    case 'capacitor':
      return <CapacitorForm spec={block.data} onChange={(data) => onChange({ ...block, data })} readOnly={readOnly} testId="field" />;
    case 'diode':
      return <DiodeForm spec={block.data} onChange={(data) => onChange({ ...block, data })} readOnly={readOnly} testId="field" />;
    case 'resistor':
      return <ResistorForm block={block} onChange={onChange} readOnly={readOnly} />;
  }
}

/**
 * The form for one block of the drawing: its label and every value of its kind, in engineering
 * notation with units. `onChange` receives the whole new block (valid by designBlockSchema);
 * refused entries are flagged at their field and never passed on. Read-only shows the values
 * without letting them change.
 */
export function BlockInspector({ block, readOnly, onChange }: { block: DesignBlock; readOnly: boolean; onChange: (next: DesignBlock) => void }) {
  return (
    <section className="space-y-3 text-ink-100" data-testid="block-inspector" data-block-id={block.id} aria-label={`${KIND_TITLE[block.kind]} ${block.label ?? block.id}`}>
      <header className="flex items-baseline justify-between gap-2">
        <h3 className="text-sm font-semibold text-copper-100">{KIND_TITLE[block.kind]}</h3>
        <span className="font-mono text-[11px] text-ink-400">{block.id}</span>
      </header>
      {readOnly ? <p className="text-[11px] text-ink-400">Read-only: values are shown, not editable.</p> : null}
      <TextCommitInput
        label="Label"
        value={block.label}
        read={(t) => readLabel(t)}
        onCommit={(label) => onChange(withLabel(block, label))}
        readOnly={readOnly}
        placeholder={KIND_TITLE[block.kind]}
        testId="field-label"
      />
      <KindForm block={block} onChange={onChange} readOnly={readOnly} />
      {/* Variant switches change the ports; naming them tells the designer which wires now need redrawing. */}
      <p className="text-[11px] text-ink-400" data-testid="inspector-ports">
        Ports: <span className="font-mono">{portsOf(block).join(', ')}</span>
      </p>
    </section>
  );
}
