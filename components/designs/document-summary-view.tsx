import type { ReactNode } from 'react';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { summariseDocument } from '@/lib/client/document-summary';
import { formatSi, topologyLabel } from '@/lib/client/format';

function Item({ label, children, testId }: { label: string; children: ReactNode; testId?: string }) {
  return (
    <div>
      <dt className="text-xs uppercase tracking-wide text-ink-400">{label}</dt>
      <dd className="mt-0.5 text-sm text-ink-50" data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}

/** Read-only summary of one stored document: topology, stages, drive, load and part counts. */
/** `topology` is the server's recognition for the latest revision; `undefined` for older ones. */
export function DocumentSummaryView({ document, topology }: { document: DesignDocument; topology: string | null | undefined }) {
  const s = summariseDocument(document);
  const polarity =
    s.positiveStages && s.negativeStages ? `${s.positiveStages} positive, ${s.negativeStages} negative` : s.negativeStages ? 'negative' : 'positive';
  return (
    <dl className="grid gap-4 sm:grid-cols-3" data-testid="document-summary">
      <Item label="Topology" testId="summary-topology">
        {topology === undefined ? <span className="text-ink-400">recognised for the latest revision only</span> : topologyLabel(topology)}
      </Item>
      <Item label="Stages" testId="summary-stages">
        {s.stageCount} <span className="text-ink-400">({polarity}{s.fullStages ? `, ${s.fullStages} full-wave` : ''})</span>
      </Item>
      <Item label="Drive">
        {s.drive ? (
          <span>
            <span className="text-copper-400" data-testid="summary-drive">
              {formatSi(s.drive.amplitudeV, 'V')} {s.drive.amplitudeMode}
            </span>{' '}
            at {formatSi(s.drive.frequencyHz, 'Hz')}
            {s.drive.variant === 'centreTapped' ? ', centre-tapped' : ''}
            {s.drive.sourceResistanceOhm ? `, ${formatSi(s.drive.sourceResistanceOhm, 'Ω')} source` : ''}
          </span>
        ) : s.dcSourcesV.length ? (
          `DC ${s.dcSourcesV.map((v) => formatSi(v, 'V')).join(', ')}`
        ) : (
          'none'
        )}
      </Item>
      <Item label="Load">
        {s.load ? (s.load.mode === 'resistor' ? formatSi(s.load.resistanceOhm, 'Ω') : s.load.currentA === 0 ? 'no load (0 A)' : formatSi(s.load.currentA, 'A')) : 'none'}
        {s.bleederOhm ? <span className="text-ink-400">, bleeder {formatSi(s.bleederOhm, 'Ω')}</span> : null}
      </Item>
      <Item label="Parts" testId="summary-parts">
        {s.capacitors} capacitors, {s.diodes} diodes{s.resistors ? `, ${s.resistors} resistors` : ''}
      </Item>
      <Item label="Capacitance">{s.capacitancesF.length ? s.capacitancesF.map((c) => formatSi(c, 'F')).join(', ') : '—'}</Item>
      <Item label="Canvas">
        {s.blockCount} blocks, {s.wireCount} wires
      </Item>
      <Item label="Stray to ground">{s.strayCapacitanceF ? formatSi(s.strayCapacitanceF, 'F') : 'not modelled'}</Item>
    </dl>
  );
}
