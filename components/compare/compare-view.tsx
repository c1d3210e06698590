/**
 * The compare page's pieces, each exported so another screen (e.g. deciding an offer back) can
 * lay them out again: the header, the change table, the results table, the two drawings with the
 * legend, and the slot an offer's accept/decline control mounts in. Server-renderable (no state);
 * only the revision pickers are a client component.
 */
import Link from 'next/link';
import type { ReactNode } from 'react';
import { Notice, Panel } from '@/components/ui/notice';
import {
  comparisonTitle,
  formatMetricDelta,
  formatMetricValue,
  formatRelative,
  type BlockChange,
  type ComparisonView,
  type MetricRow,
} from '@/lib/compare';
import { CHANGE_TAG, CompareDrawing, CompareLegend, drawingAspect } from './compare-drawing';
import { RevisionPickers, type PickerSide } from './revision-pickers';

const TAG_CLASS: Record<BlockChange['kind'], string> = {
  added: 'border-lagoon-400 text-lagoon-100',
  removed: 'border-dashed border-copper-400 text-copper-100',
  changed: 'border-dotted border-ink-50 text-ink-50',
};

const CATEGORY_WORDS: Record<BlockChange['category'], string> = { drive: 'Drive', load: 'Load', part: 'Part' };

function sideName(view: ComparisonView, side: 'a' | 'b'): string {
  const s = view[side];
  return view.relation === 'revisions' ? `r${s.revision}` : `${s.title} r${s.revision}`;
}

/** Only what the pickers need crosses to the client (not the documents or the solves). */
function pickerSide(s: ComparisonView['a']): PickerSide {
  return { designId: s.designId, title: s.title, revision: s.revision, revisions: s.revisions.map((r) => ({ number: r.number, message: r.message, author: r.author })) };
}

/** Title, the relation in words, links back to both designs, and the revision pickers. */
export function CompareHeader({ view, offerId }: { view: ComparisonView; offerId: string | null }) {
  const relation =
    view.relation === 'revisions'
      ? `Two revisions of ${view.a.title}`
      : view.relation === 'fork-of-a'
        ? 'A design and its fork'
        : view.relation === 'parent-of-a'
          ? 'A fork and its parent'
          : 'Two designs';
  return (
    <header className="space-y-3">
      <p className="text-sm text-ink-400">
        <Link href={`/designs/${view.a.designId}`} className="underline decoration-ink-600 hover:text-ink-100">
          {view.a.title}
        </Link>
        {view.b.designId !== view.a.designId ? (
          <>
            {' · '}
            <Link href={`/designs/${view.b.designId}`} className="underline decoration-ink-600 hover:text-ink-100">
              {view.b.title}
            </Link>
          </>
        ) : null}
        {' · '}
        {relation}
      </p>
      <h1 className="text-2xl font-semibold text-ink-50" data-testid="compare-title">
        {comparisonTitle(view)}
      </h1>
      <RevisionPickers a={pickerSide(view.a)} b={pickerSide(view.b)} offerId={offerId} />
    </header>
  );
}

function Tag({ kind }: { kind: BlockChange['kind'] }) {
  return <span className={`inline-block rounded border px-1.5 py-0.5 text-xs font-semibold whitespace-nowrap ${TAG_CLASS[kind]}`}>{CHANGE_TAG[kind]}</span>;
}

/** What changed: one row per block (with every changed value before → after), settings, wires. */
export function ChangeTable({ view }: { view: ComparisonView }) {
  const { diff } = view;
  return (
    <Panel title="What changed" testId="compare-changes">
      {diff.identical ? (
        <p className="text-sm text-ink-200" data-testid="compare-identical">
          The two drawings hold the same parts, values and wiring{diff.moved.length > 0 ? ` (${diff.moved.length} block${diff.moved.length === 1 ? '' : 's'} only moved)` : ''}.
        </p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-xs text-ink-400">
              <tr>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Change
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Block
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Kind
                </th>
                <th scope="col" className="py-1 font-medium">
                  {sideName(view, 'a')} → {sideName(view, 'b')}
                </th>
              </tr>
            </thead>
            <tbody>
              {diff.changes.map((c) => (
                <tr key={`${c.kind}-${c.blockId}`} className="border-t border-ink-800 align-top" data-testid="compare-change" data-block={c.blockId} data-change={c.kind} data-category={c.category}>
                  <td className="py-1.5 pr-3">
                    <Tag kind={c.kind} />
                  </td>
                  <td className="py-1.5 pr-3 font-medium text-ink-50">{c.designator}</td>
                  <td className="py-1.5 pr-3 text-ink-200">{CATEGORY_WORDS[c.category]}</td>
                  <td className="py-1.5 text-ink-100">
                    {c.kind === 'changed' ? (
                      <ul className="space-y-0.5">
                        {c.relabelled ? (
                          <li data-field="label">
                            <span className="text-ink-200">label</span> {c.relabelled.before} <span aria-label="becomes">→</span>{' '}
                            <span className="font-semibold text-ink-50">{c.relabelled.after}</span>
                          </li>
                        ) : null}
                        {c.fields.map((f) => (
                          <li key={f.path} data-field={f.path}>
                            <span className="text-ink-200">{f.label}</span> <span className="tabular-nums">{f.before}</span> <span aria-label="becomes">→</span>{' '}
                            <span className="font-semibold tabular-nums text-ink-50">{f.after}</span>
                          </li>
                        ))}
                      </ul>
                    ) : (
                      <span>{c.summary}</span>
                    )}
                  </td>
                </tr>
              ))}
              {diff.settings.map((f) => (
                <tr key={`settings-${f.path}`} className="border-t border-ink-800 align-top" data-testid="compare-setting" data-field={f.path}>
                  <td className="py-1.5 pr-3">
                    <Tag kind="changed" />
                  </td>
                  <td className="py-1.5 pr-3 font-medium text-ink-50">Design settings</td>
                  <td className="py-1.5 pr-3 text-ink-200">Setting</td>
                  <td className="py-1.5 text-ink-100">
                    <span className="text-ink-200">{f.label}</span> <span className="tabular-nums">{f.before}</span> <span aria-label="becomes">→</span>{' '}
                    <span className="font-semibold tabular-nums text-ink-50">{f.after}</span>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <p className="mt-3 text-xs text-ink-400" data-testid="compare-wires" data-added={diff.wires.added} data-removed={diff.wires.removed}>
        Wiring: {diff.wires.added} wire{diff.wires.added === 1 ? '' : 's'} added, {diff.wires.removed} removed
        {diff.moved.length > 0 && !diff.identical ? ` · ${diff.moved.length} block${diff.moved.length === 1 ? '' : 's'} only moved` : ''}.
      </p>
    </Panel>
  );
}

function Cell({ row, side }: { row: MetricRow; side: 'a' | 'b' }) {
  const value = row[side];
  const note = side === 'a' ? row.aNote : row.bNote;
  const part = side === 'a' ? row.aPart : row.bPart;
  return (
    <td className="py-1.5 pr-3 tabular-nums" data-side={side} data-value={value ?? undefined}>
      {value === null ? (
        <span className="text-ink-400" title={note}>
          {note && note.length <= 60 ? note : 'no figure'}
        </span>
      ) : (
        <>
          <span className="text-ink-50">{formatMetricValue(value, row.unit)}</span>
          {part ? <span className="block text-xs text-ink-400">{part}</span> : null}
        </>
      )}
    </td>
  );
}

/** What the change did to the solved figures, with each side's reason where it did not solve. */
export function ResultsTable({ view }: { view: ComparisonView }) {
  const failed = (['a', 'b'] as const).filter((s) => !view[s].results.ok);
  return (
    <Panel title="What it did to the results" testId="compare-results">
      <div className="space-y-2">
        {failed.map((s) => {
          const r = view[s].results;
          return (
            <Notice key={s} tone="caution" testId="compare-solve-failed">
              <span data-side={s}>
                {sideName(view, s)} has no figures: {r.ok ? '' : r.reason}
              </span>
            </Notice>
          );
        })}
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-xs text-ink-400">
              <tr>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Figure (periodic steady state)
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  {sideName(view, 'a')}
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  {sideName(view, 'b')}
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Change
                </th>
                <th scope="col" className="py-1 font-medium">
                  Relative
                </th>
              </tr>
            </thead>
            <tbody>
              {view.metrics.map((row) => (
                <tr key={row.metric} className="border-t border-ink-800 align-top" data-testid="compare-metric" data-metric={row.metric} data-delta={row.delta ?? undefined}>
                  <th scope="row" className="py-1.5 pr-3 font-medium text-ink-100">
                    {row.label}
                  </th>
                  <Cell row={row} side="a" />
                  <Cell row={row} side="b" />
                  <td className="py-1.5 pr-3 tabular-nums text-ink-50">{formatMetricDelta(row.delta, row.unit)}</td>
                  <td className="py-1.5 tabular-nums text-ink-200">{formatRelative(row.relDelta)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <p className="text-xs text-ink-400">
          Both sides are solved here with the same engine the editor uses. Margins are against each part’s rating times the design’s derating
          fraction. These are simulated figures to compare two drawings, not a safety approval: follow local electrical codes and licensed practice.
        </p>
      </div>
    </Panel>
  );
}

/** Drawings wider than this (width / height) are set one above the other, so a long ladder stays legible. */
const STACK_ASPECT = 3;

/** The two drawings side by side (or, for long ladders, before above after, stage under stage) with the key to their marks. */
export function DrawingPair({ view }: { view: ComparisonView }) {
  const stacked = Math.max(drawingAspect(view.a.document), drawingAspect(view.b.document)) > STACK_ASPECT;
  return (
    <Panel title="On the drawings" testId="compare-drawings">
      <div className="space-y-3">
        <CompareLegend />
        <div className={`grid gap-4 ${stacked ? '' : 'lg:grid-cols-2'}`} data-layout={stacked ? 'stacked' : 'side-by-side'}>
          <CompareDrawing document={view.a.document} highlight={view.a.highlight} wiresOnlyHere={view.a.wiresOnlyHere} title={`Before · ${sideName(view, 'a')}`} side="a" />
          <CompareDrawing document={view.b.document} highlight={view.b.highlight} wiresOnlyHere={view.b.wiresOnlyHere} title={`After · ${sideName(view, 'b')}`} side="b" />
        </div>
      </div>
    </Panel>
  );
}

/**
 * Where an offer back's accept/decline control is mounted when the page is opened for an offer
 * (`?offer=`). The control itself belongs to the offers screen; this page only keeps its place.
 */
export function OfferActionsSlot({ offerId, children }: { offerId: string; children?: ReactNode }) {
  return (
    <div data-testid="offer-actions-slot" data-offer={offerId} className="rounded-lg border border-copper-600 bg-copper-800/20 p-4">
      {children ?? (
        <p className="text-sm text-copper-100">
          This comparison is for a fork offered back to its parent: its changes become a new revision of the parent only when the parent’s owner accepts
          them. Accepting adds a revision; it is not a review or an approval, and it does not certify that the supply is safe.
        </p>
      )}
    </div>
  );
}

/** The whole comparison: header, optional offer slot, changes, results, drawings. */
export function CompareLayout({ view, offerId, offerActions }: { view: ComparisonView; offerId: string | null; offerActions?: ReactNode }) {
  return (
    <div className="space-y-5" data-testid="compare-page">
      <CompareHeader view={view} offerId={offerId} />
      {offerId ? <OfferActionsSlot offerId={offerId}>{offerActions}</OfferActionsSlot> : null}
      <ChangeTable view={view} />
      <ResultsTable view={view} />
      <DrawingPair view={view} />
    </div>
  );
}
