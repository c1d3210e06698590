'use client';

import { Fragment, useMemo, useState } from 'react';
import type { PartStress } from '@/lib/editor/types';
import { formatPercent, formatReading } from '@/lib/editor/format';
import { resolveDerating } from '@/lib/parts/derating';
import { useEditorParts } from '@/components/parts/editor-parts-context';
import { useEditor } from '../store-context';
import { stressCounts, stressRows } from './panel-model';
import { CHECK_TONE, CHECK_WORD } from './status-text';

const DERATING_SOURCE = { team: 'team policy', design: 'this design’s setting, stricter than the team’s', default: 'common practice' } as const;

/**
 * Every part's stress against its rating and the derated limit, with the margin; rows over the
 * limit or tight are flagged. A part's name shows it on the canvas. The line above the table
 * says which derating the limits use (the stricter of the design's and the team's policy), and a
 * part bound to the team library shows its part number.
 */
export function StressTable({ parts, onFocusBlock, stale }: { parts: PartStress[]; onFocusBlock: (blockId: string) => void; stale: boolean }) {
  const [worstFirst, setWorstFirst] = useState(true);
  const rows = stressRows(parts, worstFirst);
  const counts = stressCounts(parts);
  const lib = useEditorParts();
  const docFraction = useEditor((s) => s.document.settings.deratingFraction);
  const derating = resolveDerating(docFraction, lib?.teamFraction);
  const partIdOf = useMemo(() => new Map(parts.map((p) => [p.element, p.partId] as const)), [parts]);
  return (
    <div className="space-y-1">
      <p className="text-[11px] text-ink-400" data-testid="stress-derating" data-fraction={derating.fraction} data-source={derating.source}>
        Judged at {formatPercent(derating.fraction)} of rating ({DERATING_SOURCE[derating.source]}).
      </p>
      <div className="flex items-center justify-between gap-2 text-xs">
        <p className="text-ink-200" data-testid="stress-summary">
          {counts.over > 0 ? <span className="font-semibold text-hazard-100">{counts.over} over the derated limit</span> : <span className="text-lagoon-100">none over the limit</span>}
          {counts.tight > 0 ? <span className="text-copper-100"> · {counts.tight} tight</span> : null}
          {counts.unrated > 0 ? <span className="text-ink-400"> · {counts.unrated} without ratings</span> : null}
        </p>
        <label className="flex items-center gap-1 text-ink-400">
          <input type="checkbox" checked={worstFirst} onChange={(e) => setWorstFirst(e.target.checked)} className="accent-lagoon-400" />
          worst first
        </label>
      </div>
      <div className="max-h-72 overflow-auto rounded border border-ink-800">
        <table data-testid="stress-table" data-stale={stale ? 'true' : 'false'} className={`w-full border-collapse text-xs ${stale ? 'opacity-70' : ''}`}>
          <caption className="sr-only">Part stress against rating and derated limit</caption>
          <thead className="sticky top-0 z-10 bg-ink-800 text-ink-200">
            <tr>
              <th scope="col" className="px-1.5 py-1 text-left font-medium">Quantity</th>
              <th scope="col" className="px-1.5 py-1 text-right font-medium">Actual</th>
              <th scope="col" className="px-1.5 py-1 text-right font-medium">Rating</th>
              <th scope="col" className="px-1.5 py-1 text-right font-medium">Derated</th>
              <th scope="col" className="px-1.5 py-1 text-right font-medium">Margin</th>
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={5} className="px-2 py-2 text-ink-400">
                  No part stress yet.
                </td>
              </tr>
            ) : null}
            {rows.map((r) => (
              <Fragment key={r.key}>
                {r.firstOfPart ? (
                  <tr className="border-t border-ink-800 bg-ink-900">
                    <th scope="rowgroup" colSpan={5} className="px-1.5 pt-1 text-left font-medium">
                      <button
                        type="button"
                        onClick={() => onFocusBlock(r.blockId)}
                        className="rounded text-ink-100 hover:text-copper-100"
                        title="Show this part on the canvas"
                        data-testid="stress-part"
                        data-block-id={r.blockId}
                      >
                        {r.partLabel}
                      </button>
                      <span className="ml-2 font-mono text-[10px] font-normal text-ink-400">{r.element}</span>
                      <BoundPartNumber partId={partIdOf.get(r.element)} />
                    </th>
                  </tr>
                ) : null}
                <tr data-status={r.status} data-block-id={r.blockId} data-element={r.element} data-quantity={r.quantity} data-margin={r.margin ?? ''} className={r.status === 'over' ? 'bg-hazard-700/25' : r.status === 'tight' ? 'bg-copper-800/25' : ''}>
                  <td className="px-1.5 py-0.5 pl-3 leading-tight text-ink-400">{r.quantity}</td>
                  <td className="whitespace-nowrap px-1.5 py-0.5 text-right font-mono text-ink-100">{formatReading(r.actual, r.unit, 3)}</td>
                  <td className="whitespace-nowrap px-1.5 py-0.5 text-right font-mono text-ink-200">{formatReading(r.rating, r.unit, 3)}</td>
                  <td className="whitespace-nowrap px-1.5 py-0.5 text-right font-mono text-ink-200">{formatReading(r.allowed, r.unit, 3)}</td>
                  <td className={`whitespace-nowrap px-1.5 py-0.5 text-right font-mono ${CHECK_TONE[r.status]}`}>
                    {r.margin !== null ? formatPercent(r.margin, 2) : CHECK_WORD[r.status]}
                    {r.status === 'over' || r.status === 'tight' ? <span className="block font-sans text-[9px] uppercase leading-none">{CHECK_WORD[r.status]}</span> : null}
                  </td>
                </tr>
              </Fragment>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

/** The library part number of a bound part ("library part" when it is no longer in the library). */
function BoundPartNumber({ partId }: { partId: string | undefined }) {
  const lib = useEditorParts();
  if (!partId || !lib) return null;
  const part = lib.byId.get(partId);
  if (!part && lib.loading) return null;
  return (
    <span className="ml-2 rounded border border-copper-600 px-1 font-mono text-[10px] font-normal text-copper-100" data-testid="stress-part-number" title={part ? 'Bound to this team library part' : 'Bound to a part no longer in the team library'}>
      {part ? part.partNumber : 'library part (removed)'}
    </span>
  );
}
