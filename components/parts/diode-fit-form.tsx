'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { formatReading } from '@/lib/editor/format';
import { fitFromRows, modelFieldText, type FitOutcome, type FitRow } from './diode-fit-model';

const EMPTY: FitRow[] = [
  { current: '', voltage: '' },
  { current: '', voltage: '' },
  { current: '', voltage: '' },
];

/**
 * Fit the diode model from the datasheet's forward curve: read two or three points (forward
 * current, forward voltage) off the typical curve at 25 °C; two give IS and N with RS = 0, three
 * give IS, N and RS. The fit shows each point's residual (model − datasheet) before its values
 * go into the form.
 */
export function DiodeFitForm({ onUse, onCancel }: { onUse: (fields: Record<string, string>) => void; onCancel: () => void }) {
  const [rows, setRows] = useState<FitRow[]>(EMPTY);
  const [outcome, setOutcome] = useState<FitOutcome | null>(null);
  const set = (i: number, key: keyof FitRow, v: string) => {
    setOutcome(null);
    setRows((rs) => rs.map((r, j) => (j === i ? { ...r, [key]: v } : r)));
  };
  const errors = outcome && !outcome.ok ? outcome.errors : {};
  const input = (i: number, key: keyof FitRow, unit: string, label: string) => {
    const err = errors[`${key}-${i}`];
    return (
      <label className="block text-xs text-ink-200">
        <span className="sr-only">
          Point {i + 1} {label}
        </span>
        <span className={`flex items-stretch overflow-hidden rounded border bg-ink-900 ${err ? 'border-hazard-500' : 'border-ink-600'}`}>
          <input value={rows[i][key]} onChange={(e) => set(i, key, e.target.value)} aria-invalid={err ? true : undefined} className="w-24 min-w-0 flex-1 bg-transparent px-2 py-1 font-mono text-sm text-ink-50 outline-none" data-testid={`fit-${key}-${i}`} />
          <span className="flex items-center border-l border-ink-600 bg-ink-800 px-1.5 font-mono text-[11px]">{unit}</span>
        </span>
        {err ? (
          <span role="alert" className="mt-0.5 block text-[11px] text-hazard-100">
            {err}
          </span>
        ) : null}
      </label>
    );
  };
  return (
    <div className="space-y-2 rounded-md border border-lagoon-600 bg-ink-900/60 p-3" data-testid="diode-fit">
      <p className="text-xs text-ink-200">
        Read two or three points off the datasheet&apos;s forward curve (typical, 25 °C), low to high current. Two points fit IS and N (RS = 0); three also fit RS.
      </p>
      <table className="text-xs">
        <thead>
          <tr className="text-ink-400">
            <th scope="col" className="pr-2 text-left font-medium">Point</th>
            <th scope="col" className="pr-2 text-left font-medium">Forward current IF</th>
            <th scope="col" className="pr-2 text-left font-medium">Forward voltage VF</th>
            <th scope="col" className="text-right font-medium">Residual</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((_, i) => {
            const okOutcome = outcome && outcome.ok ? outcome : null;
            const filled = rows.slice(0, i + 1).filter((r) => r.current.trim() || r.voltage.trim()).length - 1;
            const res = okOutcome && (rows[i].current.trim() || rows[i].voltage.trim()) ? okOutcome.residualsV[filled] : undefined;
            return (
              <tr key={i} className="align-top">
                <td className="pr-2 pt-1 text-ink-400">{i + 1}{i === 2 ? ' (optional)' : ''}</td>
                <td className="pb-1 pr-2">{input(i, 'current', 'A', 'forward current')}</td>
                <td className="pb-1 pr-2">{input(i, 'voltage', 'V', 'forward voltage')}</td>
                <td className="pt-1 text-right font-mono text-ink-200" data-testid={`fit-residual-${i}`}>
                  {res !== undefined ? formatReading(res, 'V', 3) : '—'}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {outcome && !outcome.ok && outcome.reason ? (
        <p role="alert" className="text-xs text-hazard-100" data-testid="fit-reason">
          {outcome.reason}
        </p>
      ) : null}
      {outcome && outcome.ok ? (
        <p className="text-xs text-lagoon-100" data-testid="fit-result">
          IS = {formatReading(outcome.model.isA, 'A', 4)}, N = {Number(outcome.model.n.toPrecision(4))}, RS = {formatReading(outcome.model.rsOhm, 'Ω', 4)}
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" onClick={() => setOutcome(fitFromRows(rows))} data-testid="fit-run">
          Fit
        </Button>
        <Button onClick={() => outcome && outcome.ok && onUse(modelFieldText(outcome.model))} disabled={!outcome || !outcome.ok} data-testid="fit-use">
          Use these values
        </Button>
        <Button variant="ghost" onClick={onCancel}>
          Close
        </Button>
      </div>
    </div>
  );
}
