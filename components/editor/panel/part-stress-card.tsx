import type { PartStress } from '@/lib/editor/types';
import { formatPercent, formatReading } from '@/lib/editor/format';
import { checkStatus, quantityLabel } from './panel-model';
import { CHECK_TONE, CHECK_WORD } from './status-text';
import { useEditorParts } from '@/components/parts/editor-parts-context';

/**
 * The reading that appears over a block: each of its parts' stresses against the derated
 * rating, with the margin, flagged when over the limit or tight; a part bound to the team
 * library shows its part number.
 */
export function PartStressCard({ stresses, title }: { stresses: PartStress[]; title: string }) {
  const lib = useEditorParts();
  const worst = stresses.some((p) => p.status === 'over') ? 'over' : stresses.some((p) => p.status === 'tight') ? 'tight' : 'ok';
  return (
    <div
      role="status"
      aria-live="polite"
      data-testid="part-stress-card"
      data-worst={worst}
      className={`pointer-events-none w-80 rounded-md border bg-ink-900/95 px-3 py-2 text-xs shadow-lg shadow-black/40 ${
        worst === 'over' ? 'border-hazard-500' : worst === 'tight' ? 'border-copper-600' : 'border-lagoon-600'
      }`}
    >
      <p className="mb-1 truncate font-semibold text-ink-50">{title}</p>
      {stresses.length === 0 ? <p className="text-ink-400">No stress figures for this block yet.</p> : null}
      <ul className="space-y-1.5">
        {stresses.map((p) => (
          <li key={`${p.blockId}:${p.role}`} data-status={p.status}>
            <p className="flex justify-between gap-2 text-ink-200">
              <span className="truncate">
                {p.label}
                {p.partId && lib?.byId.get(p.partId) ? <span className="ml-1.5 font-mono text-[10px] text-copper-100">{lib.byId.get(p.partId)?.partNumber}</span> : null}
              </span>
              <span className="shrink-0 font-mono text-[10px] text-ink-400">{p.element}</span>
            </p>
            <table className="w-full">
              <tbody>
                {p.checks.map((c) => {
                  const st = checkStatus(c);
                  return (
                    <tr key={c.quantity} className={CHECK_TONE[st]}>
                      <td className="pr-2 leading-tight text-ink-400">{quantityLabel(c.quantity)}</td>
                      <td className="whitespace-nowrap text-right font-mono">{formatReading(c.actual, c.unit, 3)}</td>
                      <td className="px-1 text-center text-ink-400">/</td>
                      <td className="whitespace-nowrap text-right font-mono text-ink-200">{c.allowed !== undefined ? formatReading(c.allowed, c.unit, 3) : '—'}</td>
                      <td className="whitespace-nowrap pl-2 text-right font-mono" title={CHECK_WORD[st]}>
                        {c.margin !== undefined ? formatPercent(c.margin, 2) : CHECK_WORD[st]}
                        {st === 'over' ? ' ✕' : st === 'tight' ? ' !' : ''}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </li>
        ))}
      </ul>
      <p className="mt-1 text-[10px] text-ink-400">actual / derated limit · margin</p>
    </div>
  );
}
