import type { ReactNode } from 'react';

type Tone = 'error' | 'info' | 'success' | 'caution';

const tones: Record<Tone, string> = {
  error: 'border-hazard-700 bg-hazard-700/20 text-hazard-100',
  info: 'border-ink-600 bg-ink-800 text-ink-100',
  success: 'border-lagoon-600 bg-lagoon-800/40 text-lagoon-100',
  caution: 'border-copper-600 bg-copper-800/30 text-copper-100',
};

/** A boxed message; errors are announced to screen readers. */
export function Notice({ tone = 'info', children, testId }: { tone?: Tone; children: ReactNode; testId?: string }) {
  return (
    <div
      className={`rounded-md border px-3 py-2 text-sm ${tones[tone]}`}
      role={tone === 'error' ? 'alert' : 'status'}
      data-testid={testId}
    >
      {children}
    </div>
  );
}

/** A small pill label (status, role, visibility). */
export function Badge({ children, tone = 'neutral', testId }: { children: ReactNode; tone?: 'neutral' | 'live' | 'result' | 'warn'; testId?: string }) {
  const cls = {
    neutral: 'border-ink-600 text-ink-200',
    live: 'border-copper-600 text-copper-100',
    result: 'border-lagoon-600 text-lagoon-100',
    warn: 'border-hazard-700 text-hazard-100',
  }[tone];
  return (
    <span className={`inline-flex items-center rounded-full border px-2 py-0.5 text-xs font-medium ${cls}`} data-testid={testId}>
      {children}
    </span>
  );
}

/** A panel with an optional heading. */
export function Panel({ title, actions, children, className = '', testId }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; className?: string; testId?: string }) {
  return (
    <section className={`rounded-lg border border-ink-800 bg-ink-800/60 p-4 ${className}`} data-testid={testId}>
      {title || actions ? (
        <div className="mb-3 flex items-center justify-between gap-3">
          {title ? <h2 className="text-base font-semibold text-ink-50">{title}</h2> : <span />}
          {actions}
        </div>
      ) : null}
      {children}
    </section>
  );
}

/** Loading placeholder rows while a query is pending. */
export function Skeleton({ lines = 3 }: { lines?: number }) {
  return (
    <div className="space-y-2" aria-hidden="true">
      {Array.from({ length: lines }, (_, i) => (
        <div key={i} className="h-4 animate-pulse rounded bg-ink-600/40" style={{ width: `${90 - i * 12}%` }} />
      ))}
    </div>
  );
}
