'use client';

import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { formError } from '@/lib/client/api';
import { useImportParts } from '@/lib/client/parts';
import type { PartImportReport } from '@/lib/parts/schema';
import { Modal } from './modal';

/** Largest CSV the import takes (characters; the server's limit). */
const MAX_CSV_CHARS = 900_000;

function ReportView({ report }: { report: PartImportReport }) {
  return (
    <div className="space-y-2" data-testid="import-report" data-dry-run={report.dryRun ? 'true' : 'false'}>
      <p className="text-sm text-ink-100" data-testid="import-summary">
        {report.dryRun ? 'Dry run — nothing saved yet: ' : 'Imported: '}
        <strong>{report.created}</strong> new, <strong>{report.updated}</strong> replacing parts with the same number, <strong>{report.rejected.length}</strong> rejected.
      </p>
      {report.rejected.length > 0 ? (
        <div className="max-h-64 overflow-auto rounded border border-ink-600">
          <table className="w-full text-xs" data-testid="import-rejected">
            <caption className="sr-only">Rejected rows</caption>
            <thead className="sticky top-0 bg-ink-800 text-ink-200">
              <tr>
                <th scope="col" className="px-2 py-1 text-right font-medium">Line</th>
                <th scope="col" className="px-2 py-1 text-left font-medium">Part number</th>
                <th scope="col" className="px-2 py-1 text-left font-medium">Why</th>
              </tr>
            </thead>
            <tbody>
              {report.rejected.map((r) => (
                <tr key={r.line} className="border-t border-ink-800 align-top" data-testid="import-rejected-row" data-line={r.line}>
                  <td className="px-2 py-1 text-right font-mono tabular-nums text-ink-200">{r.line}</td>
                  <td className="px-2 py-1 font-mono text-ink-100">{r.partNumber ?? '—'}</td>
                  <td className="px-2 py-1 text-hazard-100">
                    <ul className="list-disc pl-4">
                      {r.reasons.map((reason, i) => (
                        <li key={i}>{reason}</li>
                      ))}
                    </ul>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
    </div>
  );
}

/**
 * Import parts from a CSV file: the file is read in the browser, a dry run reports every row
 * (created, replacing a part with the same number, or rejected with its line and reasons), and
 * only then does "Import" save. Rejected rows are never saved.
 */
export function ImportDialog({ teamId, onClose }: { teamId: string; onClose: () => void }) {
  const fileId = useId();
  const run = useImportParts(teamId);
  const [file, setFile] = useState<{ name: string; csv: string } | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const [report, setReport] = useState<PartImportReport | null>(null);

  async function pick(f: File | undefined) {
    setReport(null);
    setReadError(null);
    run.reset();
    if (!f) return setFile(null);
    const csv = await f.text();
    if (csv.length > MAX_CSV_CHARS) {
      setFile(null);
      setReadError(`${f.name} is too large (at most ${MAX_CSV_CHARS.toLocaleString('en-GB')} characters).`);
      return;
    }
    setFile({ name: f.name, csv });
  }

  function go(dryRun: boolean) {
    if (!file) return;
    run.mutate({ csv: file.csv, dryRun }, { onSuccess: setReport });
  }

  const checked = report?.dryRun === true;
  const done = report?.dryRun === false;
  return (
    <Modal open onClose={onClose} title="Import parts from CSV" testId="import-dialog" wide>
      <div className="space-y-1 text-sm text-ink-200">
        <p>
          One part per row under a header line. <span className="font-mono text-xs">kind</span> and <span className="font-mono text-xs">part_number</span> are required; then{' '}
          <span className="font-mono text-xs">description, maker, unit_cost, currency</span> and the values of the kind:
        </p>
        <ul className="list-disc pl-5 font-mono text-xs text-ink-100">
          <li>capacitor: capacitance, tolerance, rated_voltage, esr, dielectric, size</li>
          <li>diode: rated_piv, avg_current, surge_current, trr, is, n, rs, cjo, tt</li>
          <li>resistor: resistance, power, rated_voltage, tolerance</li>
        </ul>
        <p>
          Numbers in engineering notation (<span className="font-mono text-xs">10n</span>, <span className="font-mono text-xs">15kV</span>, <span className="font-mono text-xs">2.2meg</span>; write meg, not M). A row whose part number already exists in the
          team replaces that part. Check the file with a dry run first; nothing is saved until you import.
        </p>
      </div>
      <div>
        <label htmlFor={fileId} className="mb-1 block text-sm font-medium text-ink-200">
          CSV file
        </label>
        <input id={fileId} type="file" accept=".csv,text/csv" onChange={(e) => void pick(e.target.files?.[0])} data-testid="parts-import-file" className="block text-sm text-ink-100 file:mr-3 file:rounded-md file:border file:border-ink-600 file:bg-ink-800 file:px-3 file:py-1.5 file:text-ink-100" />
      </div>
      {readError ? <Notice tone="error">{readError}</Notice> : null}
      {run.error ? <Notice tone="error">{formError(run.error)}</Notice> : null}
      {report ? <ReportView report={report} /> : null}
      <div className="flex justify-end gap-2">
        <Button variant="ghost" onClick={onClose}>
          {done ? 'Close' : 'Cancel'}
        </Button>
        {!done ? (
          <Button variant="secondary" onClick={() => go(true)} disabled={!file} pending={run.isPending && run.variables?.dryRun === true} pendingLabel="Checking…" data-testid="import-dry-run">
            Dry run
          </Button>
        ) : null}
        {!done ? (
          <Button onClick={() => go(false)} disabled={!file || !checked || (report?.created ?? 0) + (report?.updated ?? 0) === 0} pending={run.isPending && run.variables?.dryRun === false} pendingLabel="Importing…" data-testid="import-confirm">
            Import {checked ? `${(report?.created ?? 0) + (report?.updated ?? 0)} part(s)` : ''}
          </Button>
        ) : null}
      </div>
    </Modal>
  );
}
