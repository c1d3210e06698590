import type { EngineStatus, NodeReading } from '@/lib/editor/types';
import { readingText } from './panel-model';
import { ENGINE_STATUS_TEXT } from './status-text';

/**
 * The reading that appears at the pointer over a node: its DC level, ripple peak-to-peak and
 * the lowest and highest voltage to ground, in engineering notation. Marked stale when it
 * belongs to an older edit than the canvas. `data-mean-v` carries the raw DC level (V).
 */
export function NodeReadingCard({ reading, status, stale }: { reading: NodeReading; status: EngineStatus; stale: boolean }) {
  const t = readingText(reading);
  return (
    <div
      role="status"
      aria-live="polite"
      data-testid="node-reading"
      data-node={reading.node}
      data-mean-v={String(reading.meanV)}
      data-stale={stale ? 'true' : 'false'}
      className={`pointer-events-none w-56 rounded-md border bg-ink-900/95 px-3 py-2 text-xs shadow-lg shadow-black/40 ${stale ? 'border-copper-600 border-dashed' : 'border-lagoon-600'}`}
    >
      <div className="mb-1 flex items-baseline justify-between gap-2">
        <span className="truncate font-semibold text-ink-50" title={reading.label}>
          {reading.label}
        </span>
        <span className="shrink-0 font-mono text-[10px] text-ink-400">{reading.node}</span>
      </div>
      <p className="font-mono text-lg leading-tight text-lagoon-100" aria-label={`DC level ${t.mean}`}>
        {t.mean}
        <span className="ml-1 font-sans text-[10px] font-normal text-ink-400">DC to ground</span>
      </p>
      <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
        <dt className="text-ink-400">Ripple p-p</dt>
        <dd className="text-right font-mono text-ink-100">{t.ripple}</dd>
        <dt className="text-ink-400">Min</dt>
        <dd className="text-right font-mono text-ink-100">{t.min}</dd>
        <dt className="text-ink-400">Max</dt>
        <dd className="text-right font-mono text-ink-100">{t.max}</dd>
      </dl>
      {stale ? (
        <p className="mt-1 text-[10px] text-copper-100">Out of date — from an earlier edit ({ENGINE_STATUS_TEXT[status]})</p>
      ) : status !== 'solved' ? (
        <p className="mt-1 text-[10px] text-ink-400">{ENGINE_STATUS_TEXT[status]}</p>
      ) : null}
    </div>
  );
}
