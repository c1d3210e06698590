'use client';
/**
 * What the engine made of the drawing, above the canvas: the topology badge, which result is
 * current (solving / solved / out of date / cannot solve: why), and the diagnostics list whose
 * entries focus the block at fault.
 */
import type { Diagnostic } from '@/lib/circuit/compile/diagnostics';
import type { EngineSnapshot } from '@/lib/editor/types';
import { canvasStatus, type CanvasEngineStatus } from './canvas-model';

const STATUS_CLASS: Record<CanvasEngineStatus, string> = {
  idle: 'border-ink-600 text-ink-200',
  solving: 'border-copper-600 text-copper-100',
  solved: 'border-lagoon-600 text-lagoon-100',
  'out-of-date': 'border-copper-600 text-copper-100',
  'cannot-solve': 'border-hazard-700 bg-hazard-700/20 text-hazard-100',
};

export function TopologyBadge({ snapshot, empty = false }: { snapshot: EngineSnapshot; empty?: boolean }) {
  const badge = empty ? undefined : snapshot.compile?.badge;
  return (
    <span
      data-testid="topology-badge"
      data-kind={badge?.kind ?? ''}
      data-stages={badge?.stages ?? ''}
      className="inline-flex items-center rounded-full border border-lagoon-600 px-2.5 py-0.5 text-xs font-semibold text-lagoon-100"
    >
      {badge ? badge.label : empty ? 'Empty canvas' : 'Not compiled yet'}
    </span>
  );
}

/** The engine's own timings as `data-ms-*` attributes, for the canvas benchmark (scripts/bench-canvas.ts). */
function timingAttributes(s: EngineSnapshot): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(s.timings)) if (typeof v === 'number' && Number.isFinite(v)) out[`data-ms-${k.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`] = v.toFixed(1);
  return out;
}

export function EngineStatusPill({ snapshot, empty = false }: { snapshot: EngineSnapshot; empty?: boolean }) {
  const { status, text } = canvasStatus(snapshot, { empty });
  const busy = status === 'solving' || (status === 'out-of-date' && snapshot.status === 'compiling');
  return (
    <span
      data-testid="engine-status"
      data-status={status}
      data-current-version={snapshot.currentVersion}
      data-compiled-version={snapshot.compiledVersion ?? ''}
      data-solved-version={snapshot.solvedVersion ?? ''}
      data-warmup-pending={snapshot.warmupPending ? 'true' : 'false'}
      {...timingAttributes(snapshot)}
      role="status"
      aria-live="polite"
      className={`inline-flex max-w-full items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-xs ${STATUS_CLASS[status]}`}
    >
      {busy ? <span className="inline-block h-2 w-2 animate-pulse rounded-full bg-copper-400" aria-hidden="true" /> : null}
      <span className="truncate">{text}</span>
    </span>
  );
}

const SEVERITY_CLASS: Record<Diagnostic['severity'], string> = {
  error: 'border-hazard-700 text-hazard-100',
  warning: 'border-copper-600 text-copper-100',
  info: 'border-ink-600 text-ink-200',
};

/** Diagnostics of the current compile, errors first; pressing one focuses its block. */
export function DiagnosticsList({ snapshot, onFocusBlock }: { snapshot: EngineSnapshot; onFocusBlock: (blockId: string) => void }) {
  const list = snapshot.compile?.diagnostics ?? [];
  const order = { error: 0, warning: 1, info: 2 } as const;
  const sorted = [...list].sort((a, b) => order[a.severity] - order[b.severity]);
  return (
    <div data-testid="diagnostics-list" data-count={sorted.length} aria-label="Diagnostics">
      {sorted.length === 0 ? (
        <p className="text-xs text-ink-400">{snapshot.compile ? 'No diagnostics: the drawing compiles cleanly.' : 'No compile yet.'}</p>
      ) : (
        <ul className="space-y-1">
          {sorted.map((d, i) => (
            <li key={`${d.code}-${d.blockId ?? ''}-${d.node ?? ''}-${i}`}>
              <button
                type="button"
                disabled={!d.blockId}
                onClick={() => d.blockId && onFocusBlock(d.blockId)}
                data-testid="diagnostic"
                data-severity={d.severity}
                data-block={d.blockId ?? ''}
                className={`w-full rounded-md border px-2 py-1 text-left text-xs ${SEVERITY_CLASS[d.severity]} enabled:hover:bg-ink-800 disabled:cursor-default`}
              >
                <span className="font-semibold">{d.severity === 'error' ? 'Error' : d.severity === 'warning' ? 'Warning' : 'Note'}:</span> {d.message}
                {d.blockId ? <span className="ml-1 text-ink-400">(show {d.blockId})</span> : null}
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
