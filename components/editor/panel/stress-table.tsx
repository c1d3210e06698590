'use client';

import { Fragment, useState } from 'react';
import type { PartStress } from '@/lib/editor/types';
import { formatPercent, formatReading } from '@/lib/editor/format';
import { stressCounts, stressRows } from './panel-model';
import { CHECK_TONE, CHECK_WORD } from './status-text';

/**
 * Every part's stress against its rating and the derated limit, with the margin; rows over the
 * limit or tight are flagged. A part's name shows it on the canvas.
 */
export function StressTable({ parts, onFocusBlock, stale }: { parts: PartStress[]; onFocusBlock: (blockId: string) => void; stale: boolean }) {
  const [worstFirst, setWorstFirst] = useState(true);
  const rows = stressRows(parts, worstFirst);
  const counts = stressCounts(parts);
  return (
    <div className="space-y-1">
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
                    </th>
                  </tr>
                ) : null}
                <tr data-status={r.status} data-block-id={r.blockId} className={r.status === 'over' ? 'bg-hazard-700/25' : r.status === 'tight' ? 'bg-copper-800/25' : ''}>
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
