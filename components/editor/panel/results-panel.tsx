'use client';

import { memo, useDeferredValue, useMemo, type ReactNode } from 'react';
import type { EngineSnapshot, NodeReading } from '@/lib/editor/types';
import { formatReading } from '@/lib/editor/format';
import { CompareTable } from './compare-table';
import { NodeTable } from './node-table';
import { nodeRows, statusLine } from './panel-model';
import { SafetySection } from './safety-section';
import { STATUS_TONE_CLASS } from './status-text';
import { StressTable } from './stress-table';
import { WaveformPlot } from './waveform-plot';
import { WarmupPlot } from './warmup-plot';

function Section({ title, note, children, testId, open = true }: { title: string; note?: ReactNode; children: ReactNode; testId?: string; open?: boolean }) {
  return (
    <details open={open} className="border-b border-ink-800 pb-2" data-testid={testId}>
      <summary className="flex cursor-pointer select-none items-baseline justify-between gap-2 py-1.5 text-xs font-semibold uppercase tracking-wide text-ink-200 marker:text-ink-400">
        <span>{title}</span>
        {note ? <span className="truncate text-[10px] font-normal normal-case tracking-normal text-ink-400">{note}</span> : null}
      </summary>
      <div className="pt-1">{children}</div>
    </details>
  );
}

// Each section re-renders only when its own inputs change: an engine snapshot that moves the
// status (compiling → estimate → solve → warm-up) must not redraw the tables and plots whose data
// it did not touch (measured: the plots' re-renders were most of the main thread's work per edit).
const CompareTableMemo = memo(CompareTable);
const NodeTableMemo = memo(NodeTable);
const StressTableMemo = memo(StressTable);
const WaveformPlotMemo = memo(WaveformPlot);
const WarmupPlotMemo = memo(WarmupPlot);
const SafetySectionMemo = memo(SafetySection);
const NO_LABELS: Record<string, string> = {};

function Pending({ children }: { children: ReactNode }) {
  return <p className="text-xs text-ink-400">{children}</p>;
}

/**
 * The side panel of results: the status line (which edit the results belong to), every node's
 * voltages, part stress with margins, the estimate beside the solve, one period of the selected
 * nodes, the output's warm-up and the safety figures with the cautions. It works from whatever
 * the snapshot holds: compile and estimate alone (solve pending) or a failed solve.
 */
export function ResultsPanel({
  snapshot,
  selectedNodes,
  onSelectNodes,
  onFocusBlock,
}: {
  snapshot: EngineSnapshot;
  selectedNodes: string[];
  onSelectNodes: (nodes: string[]) => void;
  onFocusBlock: (blockId: string) => void;
}) {
  const status = statusLine(snapshot);
  const { compile, estimate } = snapshot;
  // The status line and the estimate are drawn at once; the tables and plots of the solve follow
  // in a deferred render, so a new result is on screen before the heavy sections are redrawn.
  const deferred = useDeferredValue(snapshot);
  const solve = deferred.solve;
  const deferredStatus = deferred === snapshot ? status : statusLine(deferred);
  const labels = deferred.compile?.nodeLabels ?? NO_LABELS;
  const rows = useMemo(() => nodeRows(solve, deferred.compile?.nodeLabels ?? null), [solve, deferred.compile?.nodeLabels]);
  const outputs = solve?.outputs ?? deferred.compile?.outputs ?? [];
  // With nothing selected the plot shows the output(s), so it is never empty after a solve.
  const plotted = useMemo<NodeReading[]>(
    () =>
      solve
        ? (selectedNodes.length > 0 ? selectedNodes : solve.outputs.map((o) => o.node)).map((n) => solve.nodes[n]).filter((r): r is NodeReading => r !== undefined)
        : [],
    [solve, selectedNodes],
  );
  const mainOutput = outputs[0]?.node;
  const waiting = deferred.status === 'cannot-solve' ? 'No solve: see the status above.' : 'Waiting for the steady-state solve…';
  const compareSolve = snapshot.solve;

  return (
    <section data-testid="results-panel" aria-label="Results" className="flex h-full min-h-0 flex-col bg-ink-900 text-ink-100">
      <div
        role="status"
        aria-live="polite"
        data-testid="panel-status"
        data-status={snapshot.status}
        data-stale={status.solveStale ? 'true' : 'false'}
        className={`m-2 flex items-start gap-2 rounded border px-2 py-1.5 text-xs ${STATUS_TONE_CLASS[status.tone]}`}
      >
        <span
          aria-hidden="true"
          className={`mt-1 inline-block h-2 w-2 shrink-0 rounded-full ${
            status.tone === 'current' ? 'bg-lagoon-400' : status.tone === 'failed' ? 'bg-hazard-500' : status.tone === 'idle' ? 'bg-ink-400' : 'animate-pulse bg-copper-400'
          }`}
        />
        <span className="min-w-0 flex-1 break-words">{status.text}</span>
        {compile?.badge ? <span className="shrink-0 text-[10px] text-ink-400">{compile.badge.label}</span> : null}
      </div>

      <div className="min-h-0 flex-1 space-y-1 overflow-y-auto px-2 pb-4">
        <Section title="Estimate vs solve" testId="panel-compare" note={estimate ? `${estimate.result.topology}, ${estimate.result.stages} stage${estimate.result.stages === 1 ? '' : 's'} per ladder` : undefined}>
          {estimate || compareSolve ? (
            <CompareTableMemo estimate={estimate?.result ?? null} solve={compareSolve} warmupPending={snapshot.warmupPending} solveStale={status.solveStale} estimateStale={status.estimateStale} />
          ) : (
            <Pending>{snapshot.status === 'cannot-solve' ? 'Nothing to compare: the drawing does not compile.' : 'Waiting for the compile…'}</Pending>
          )}
        </Section>

        <Section title="Nodes" testId="panel-nodes" note={solve ? 'click to plot · ☐ adds to the plot' : undefined}>
          {deferred.compile || solve ? <NodeTableMemo rows={rows} selected={selectedNodes} onSelect={onSelectNodes} stale={deferredStatus.solveStale} /> : <Pending>Waiting for the compile…</Pending>}
          {!solve && deferred.compile ? <Pending>{waiting}</Pending> : null}
        </Section>

        <Section title="One period" testId="panel-waveform" note={solve ? `${formatReading(solve.frequencyHz, 'Hz', 3)} · period ${formatReading(solve.periodS, 's', 3)}` : undefined}>
          {solve ? <WaveformPlotMemo readings={plotted} periodS={solve.periodS} /> : <Pending>{waiting}</Pending>}
        </Section>

        <Section title="Warm-up of the output" testId="panel-warmup">
          {solve?.warmup ? (
            <WarmupPlotMemo warmup={solve.warmup} outputLabel={mainOutput ? (labels[mainOutput] ?? solve.nodes[mainOutput]?.label ?? mainOutput) : 'output'} />
          ) : solve && deferred.warmupPending ? (
            <Pending>Warm-up from power-on is running…</Pending>
          ) : (
            <Pending>
              {deferred.estimate ? `Estimate: 90 % after ${Number(deferred.estimate.result.warmupCycles90.toPrecision(3))} cycles (${formatReading(deferred.estimate.result.warmupTime90S, 's', 3)}). ` : ''}
              {solve ? 'No warm-up run for this solve.' : waiting}
            </Pending>
          )}
        </Section>

        <Section title="Part stress" testId="panel-stress" note={solve ? 'click a part to show it' : undefined}>
          {solve ? <StressTableMemo parts={solve.parts} onFocusBlock={onFocusBlock} stale={deferredStatus.solveStale} /> : <Pending>{waiting}</Pending>}
        </Section>

        <Section title="Safety" testId="panel-safety">
          <SafetySectionMemo safety={solve?.safety ?? null} estimate={deferred.estimate?.result ?? null} nodeLabels={labels} />
        </Section>

        {solve ? (
          <p className="pt-1 text-[10px] text-ink-400" data-testid="panel-stats">
            Solve: {Math.round(solve.stats.solveMs)} ms, {solve.stats.shootingIterations} shooting iterations, {solve.stats.unknowns} unknowns · power in {formatReading(solve.power.sourceW, 'W', 3)}, to the load{' '}
            {formatReading(solve.power.loadW, 'W', 3)}
            {solve.power.efficiency !== null ? ` (${Math.round(solve.power.efficiency * 1000) / 10} %)` : ''}
          </p>
        ) : null}
      </div>
    </section>
  );
}
