import type { EstimateResult } from '@/lib/circuit';
import type { SolveView } from '@/lib/editor/types';
import { formatPercent, formatReading, formatSignedPercent } from '@/lib/editor/format';
import { compareRows } from './panel-model';

/** The closed-form estimate beside the full solve, with how far the estimate is from it. */
export function CompareTable({
  estimate,
  solve,
  warmupPending,
  solveStale,
  estimateStale,
}: {
  estimate: EstimateResult | null;
  solve: SolveView | null;
  warmupPending: boolean;
  solveStale: boolean;
  estimateStale: boolean;
}) {
  const rows = compareRows(estimate, solve, warmupPending);
  return (
    <div className="overflow-auto rounded border border-ink-800">
      <table data-testid="compare-table" className="w-full border-collapse text-xs">
        <caption className="sr-only">Closed-form estimate against the steady-state solve</caption>
        <thead className="bg-ink-800 text-ink-200">
          <tr>
            <th scope="col" className="px-1.5 py-1 text-left font-medium" />
            <th scope="col" className={`px-1.5 py-1 text-right font-medium ${estimateStale ? 'text-copper-100' : ''}`}>Estimate{estimateStale ? ' (old)' : ''}</th>
            <th scope="col" className={`px-1.5 py-1 text-right font-medium ${solveStale ? 'text-copper-100' : ''}`}>Solve{solveStale ? ' (old)' : ''}</th>
            <th scope="col" className="px-1.5 py-1 text-right font-medium" title="(estimate − solve) / solve">
              Est. off by
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => {
            const fmt = (v: number | null) => (r.unit === '%' ? formatPercent(v) : formatReading(v, r.unit));
            const big = r.difference !== null && Math.abs(r.difference) > 0.1;
            return (
              <tr key={r.key} data-row={r.key} className="border-t border-ink-800">
                <th scope="row" className="px-1.5 py-0.5 text-left font-normal text-ink-200">
                  {r.label}
                </th>
                <td className="whitespace-nowrap px-1.5 py-0.5 text-right font-mono text-ink-100">{fmt(r.estimate)}</td>
                <td className="whitespace-nowrap px-1.5 py-0.5 text-right font-mono text-lagoon-100" title={r.solveNote}>
                  {r.solve === null && r.solveNote ? <span className="font-sans text-[10px] text-ink-400">{r.solveNote}</span> : fmt(r.solve)}
                </td>
                <td className={`whitespace-nowrap px-1.5 py-0.5 text-right font-mono ${big ? 'text-copper-100' : 'text-ink-200'}`}>{formatSignedPercent(r.difference)}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {!estimate ? <p className="px-2 py-1 text-[11px] text-ink-400">No closed-form estimate: the drawing is not a recognised ladder.</p> : null}
    </div>
  );
}
