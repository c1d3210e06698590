'use client';

import { useState, type ChangeEvent } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import type { Comparison } from '@/lib/bench/compare';
import { axisUnit, sameScale, unitChoices } from '@/lib/bench/display';
import { AXES, MAX_BENCH_FILE_BYTES, MAX_BENCH_ROWS, type BenchKind, type BenchMapping } from '@/lib/bench/mapping';
import type { CsvError } from '@/lib/bench/parse';
import type { BenchDatasetDto, BenchInspectDto } from '@/lib/bench/types';
import { formatSi } from '@/lib/bench/units';
import { fieldError, formError } from '@/lib/client/api';
import { BenchFileError, useBenchDataset, useBenchDatasets, useDeleteBench, useInspectBench, useUploadBench } from '@/lib/client/bench';
import { formatDateTime } from '@/lib/client/format';
import { BenchPlot } from './bench-plot';

/** Rows of the error table shown at once (the plot and the summary use every point). */
const TABLE_ROWS = 200;

/** Safety text shown wherever bench measurements are taken or uploaded. */
export const BENCH_CAUTION =
  'Measuring a high-voltage supply: use a high-voltage probe or divider rated above the full output voltage, and connect or move it only with the supply switched off and every stage discharged and grounded. Stored charge in the ladder can kill after switch-off. Keep clear while it is energised and follow your local codes and licensed practice.';

function CsvErrorList({ lines, testId }: { lines: CsvError[]; testId: string }) {
  return (
    <div className="rounded-md border border-hazard-700 bg-hazard-700/20 px-3 py-2 text-sm text-hazard-100" role="alert" data-testid={testId}>
      <p className="font-medium">The file does not read:</p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {lines.map((e, i) => (
          <li key={`${e.line}-${i}`} data-testid="bench-error" data-line={e.line}>
            line {e.line}: {e.reason}
          </li>
        ))}
      </ul>
    </div>
  );
}

function stem(fileName: string): string {
  return fileName.replace(/\.[A-Za-z0-9]{1,5}$/, '') || fileName;
}

function MappingForm({ designId, revision, file, inspect, onSaved, onCancel }: { designId: string; revision: number; file: File; inspect: BenchInspectDto; onSaved: (d: BenchDatasetDto) => void; onCancel: () => void }) {
  const upload = useUploadBench(designId);
  const [m, setM] = useState<BenchMapping>(inspect.suggested);
  const [name, setName] = useState(stem(inspect.fileName));
  const [notes, setNotes] = useState('');
  const axes = AXES[m.kind];
  const set = (patch: Partial<BenchMapping>) => setM((old) => ({ ...old, ...patch }));
  const columnOptions = inspect.columns.map((c) => (
    <option key={c.index} value={c.index}>
      {c.name} {c.samples.length ? `(${c.samples.slice(0, 3).join(', ')}…)` : ''}
    </option>
  ));
  const unitSelect = (axis: 'x' | 'y') => {
    const value = axis === 'x' ? m.xScale : m.yScale;
    const choices = unitChoices(m.kind, axis, value);
    const selected = choices.find((c) => sameScale(c.scale, value)) ?? choices[0];
    return (
      <SelectField
        label={`${axis === 'x' ? axes.x : axes.y}: unit in the file`}
        value={selected.label}
        data-testid={`bench-${axis}-unit`}
        onChange={(e) => {
          const c = choices.find((o) => o.label === e.target.value);
          if (c) set(axis === 'x' ? { xScale: c.scale } : { yScale: c.scale });
        }}
      >
        {choices.map((c) => (
          <option key={c.label} value={c.label}>
            {c.label}
          </option>
        ))}
      </SelectField>
    );
  };
  const fileError = upload.error instanceof BenchFileError ? upload.error : null;
  return (
    <form
      className="space-y-3 rounded-md border border-ink-600 p-3"
      data-testid="bench-mapping"
      onSubmit={(e) => {
        e.preventDefault();
        upload.mutate({ file, mapping: m, name, notes: notes.trim() || undefined, revision }, { onSuccess: (r) => onSaved(r.dataset) });
      }}
    >
      <p className="text-xs text-ink-300" data-testid="bench-layout">
        {inspect.fileName}: {inspect.rowCount} data rows, {inspect.columns.length} columns, delimited by{' '}
        {inspect.delimiter === '\t' ? 'tabs' : `“${inspect.delimiter}”`}
        {inspect.decimalComma ? ' (decimal commas read)' : ''}
        {inspect.headerLines.length ? `, header on line ${inspect.headerLines.join(' and ')}` : ', no header'}.
      </p>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Dataset name" value={name} onChange={(e) => setName(e.target.value)} data-testid="bench-name" error={fieldError(upload.error, 'name')} required maxLength={120} />
        <SelectField label="What was measured" value={m.kind} data-testid="bench-kind" onChange={(e) => set({ kind: e.target.value as BenchKind })}>
          <option value="loadCurve">Load curve (output voltage vs load current)</option>
          <option value="ripple">Ripple capture (output voltage vs time)</option>
        </SelectField>
        <SelectField label={`${axes.x} column`} value={m.xColumn} data-testid="bench-x-column" onChange={(e) => set({ xColumn: Number(e.target.value) })}>
          {columnOptions}
        </SelectField>
        {unitSelect('x')}
        <SelectField label={`${axes.y} column`} value={m.yColumn} data-testid="bench-y-column" onChange={(e) => set({ yColumn: Number(e.target.value) })} error={fieldError(upload.error, 'mapping')}>
          {columnOptions}
        </SelectField>
        {unitSelect('y')}
      </div>
      <TextAreaField label="Notes (instrument, probe or divider, conditions)" value={notes} onChange={(e) => setNotes(e.target.value)} rows={2} maxLength={2000} data-testid="bench-notes" />
      <p className="text-xs text-ink-400">
        Compared with r{revision}. {m.kind === 'ripple' ? 'The capture is taken to be at the model’s drive frequency; its mean is removed and its phase aligned to the model.' : 'The model is solved at each measured load current (a current-mode load replaces the drawn one).'}
      </p>
      {fileError ? <CsvErrorList lines={fileError.lines} testId="bench-upload-errors" /> : null}
      {upload.error && !fileError && !fieldError(upload.error, 'name') && !fieldError(upload.error, 'mapping') ? <Notice tone="error">{formError(upload.error)}</Notice> : null}
      <div className="flex gap-2">
        <Button type="submit" pending={upload.isPending} pendingLabel="Saving…" data-testid="bench-save">
          Save and compare
        </Button>
        <Button variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function Uploader({ designId, revision, onSaved }: { designId: string; revision: number; onSaved: (d: BenchDatasetDto) => void }) {
  const inspect = useInspectBench(designId);
  const [file, setFile] = useState<File | null>(null);
  const [inputKey, setInputKey] = useState(0);
  const reset = () => {
    setFile(null);
    inspect.reset();
    setInputKey((k) => k + 1);
  };
  const choose = (e: ChangeEvent<HTMLInputElement>) => {
    const f = e.target.files?.[0] ?? null;
    setFile(f);
    inspect.reset();
    if (f) inspect.mutate(f);
  };
  const fileError = inspect.error instanceof BenchFileError ? inspect.error : null;
  return (
    <div className="space-y-3">
      <div>
        <label htmlFor="bench-file" className="mb-1 block text-sm font-medium text-ink-200">
          Upload measurements (CSV)
        </label>
        <input key={inputKey} id="bench-file" type="file" accept=".csv,.tsv,.txt,text/csv,text/plain,text/tab-separated-values" onChange={choose} data-testid="bench-file" className="block w-full text-sm text-ink-200 file:mr-3 file:rounded-md file:border file:border-ink-600 file:bg-ink-800 file:px-3 file:py-1.5 file:text-ink-100" />
        <p className="mt-1 text-xs text-ink-400">
          Comma, semicolon or tab separated; units in the headers are read (“I (mA)”, “Vout [kV]”, “t (us)”). Up to {Math.round(MAX_BENCH_FILE_BYTES / 1024 / 1024)} MB and {MAX_BENCH_ROWS.toLocaleString('en-GB')} rows.
        </p>
      </div>
      {inspect.isPending ? <p className="text-sm text-ink-300">Reading the file…</p> : null}
      {fileError ? <CsvErrorList lines={fileError.lines} testId="bench-inspect-errors" /> : null}
      {inspect.error && !fileError ? <Notice tone="error">{formError(inspect.error)}</Notice> : null}
      {file && inspect.data ? (
        <MappingForm
          key={`${file.name}-${inputKey}`}
          designId={designId}
          revision={revision}
          file={file}
          inspect={inspect.data.inspect}
          onCancel={reset}
          onSaved={(d) => {
            reset();
            onSaved(d);
          }}
        />
      ) : null}
    </div>
  );
}

function fmtPct(v: number | null): string {
  return v === null ? '—' : `${v >= 0 ? '+' : ''}${v.toFixed(2)} %`;
}

function Summary({ c }: { c: Comparison }) {
  const items: [string, string, string][] =
    c.kind === 'loadCurve'
      ? [
          ['rms', 'RMS error', formatSi(c.summary.rmsErrorV, 'V')],
          ['max-pct', 'Largest error', fmtPct(c.points.reduce<number | null>((w, p) => (p.errorPct !== null && (w === null || Math.abs(p.errorPct) > Math.abs(w)) ? p.errorPct : w), null))],
          ['slope-measured', 'Regulation measured', c.summary.measuredSlopeOhm === null ? '—' : formatSi(c.summary.measuredSlopeOhm, 'Ω')],
          ['slope-model', 'Regulation model', c.summary.modelSlopeOhm === null ? '—' : formatSi(c.summary.modelSlopeOhm, 'Ω')],
        ]
      : [
          ['pp-measured', 'Ripple p-p measured', formatSi(c.summary.measuredPpV, 'V')],
          ['pp-model', 'Ripple p-p model', formatSi(c.summary.modelPpV, 'V')],
          ['pp-error', 'p-p difference', fmtPct(c.summary.ppErrorPct)],
          ['rms', 'RMS error (aligned)', formatSi(c.summary.rmsErrorV, 'V')],
          ['mean', 'Mean measured / model', `${formatSi(c.summary.measuredMeanV, 'V')} / ${formatSi(c.summary.modelMeanV, 'V')}`],
          ['shift', 'Model shifted by', `${formatSi(c.shiftS, 's')} (${c.summary.periods.toFixed(1)} periods captured)`],
        ];
  return (
    <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4" data-testid="bench-summary">
      {items.map(([key, label, value]) => (
        <div key={key} data-testid={`bench-summary-${key}`}>
          <dt className="text-xs text-ink-400">{label}</dt>
          <dd className="font-mono text-lagoon-100">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

function ErrorTable({ c }: { c: Comparison }) {
  const x = axisUnit(c.kind === 'ripple' ? 'time' : 'current', Math.max(0, ...c.points.map((p) => Math.abs(p.x))));
  const v = axisUnit('voltage', Math.max(0, ...c.points.map((p) => Math.abs(p.measured))));
  const rows = c.points.slice(0, TABLE_ROWS);
  const xHead = c.kind === 'ripple' ? `t (${x.unit})` : `I (${x.unit})`;
  const vNote = c.kind === 'ripple' ? ' − mean' : '';
  return (
    <div className="space-y-1">
      <div className="max-h-80 overflow-auto rounded-md border border-ink-800">
        <table className="w-full text-right text-xs" data-testid="bench-table">
          <thead className="sticky top-0 bg-ink-900 text-ink-300">
            <tr>
              <th className="px-2 py-1 text-left font-medium">Line</th>
              <th className="px-2 py-1 font-medium">{xHead}</th>
              <th className="px-2 py-1 font-medium">Measured ({v.unit}{vNote})</th>
              <th className="px-2 py-1 font-medium">Model ({v.unit}{vNote})</th>
              <th className="px-2 py-1 font-medium">Error (V)</th>
              <th className="px-2 py-1 font-medium">Error (%{c.kind === 'ripple' ? ' of model p-p' : ''})</th>
            </tr>
          </thead>
          <tbody className="font-mono text-ink-100">
            {rows.map((p) => (
              <tr key={p.line} className="border-t border-ink-800" data-testid="bench-row" data-line={p.line} data-error-v={p.errorV} data-error-pct={p.errorPct ?? ''}>
                <td className="px-2 py-0.5 text-left text-ink-400">{p.line}</td>
                <td className="px-2 py-0.5">{Number((p.x * x.factor).toPrecision(5))}</td>
                <td className="px-2 py-0.5">{Number((p.measured * v.factor).toPrecision(6))}</td>
                <td className="px-2 py-0.5">{Number((p.model * v.factor).toPrecision(6))}</td>
                <td className={`px-2 py-0.5 ${Math.abs(p.errorPct ?? 0) > 5 ? 'text-hazard-100' : ''}`}>{p.errorV >= 0 ? '+' : ''}{Number(p.errorV.toPrecision(4))}</td>
                <td className="px-2 py-0.5">{fmtPct(p.errorPct)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {c.points.length > TABLE_ROWS ? (
        <p className="text-xs text-ink-400">
          The first {TABLE_ROWS} of {c.points.length} points; the plot and the figures use all of them.
        </p>
      ) : null}
    </div>
  );
}

function DatasetView({ designId, datasetId, revision, onDeleted }: { designId: string; datasetId: string; revision: number; onDeleted: () => void }) {
  const detail = useBenchDataset(datasetId, revision);
  const del = useDeleteBench(designId);
  if (detail.isPending) return <Skeleton lines={4} />;
  if (detail.isError) return <Notice tone="error">{formError(detail.error)}</Notice>;
  const d = detail.data;
  const c = d.comparison;
  return (
    <div className="space-y-3" data-testid="bench-dataset-view" data-dataset-id={d.dataset.id} data-revision={d.revision}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div>
          <h3 className="text-sm font-semibold text-ink-50">{d.dataset.name}</h3>
          <p className="text-xs text-ink-400">
            {d.dataset.kind === 'loadCurve' ? 'Load curve' : 'Ripple capture'} · {d.dataset.pointCount} points from {d.dataset.fileName} · uploaded by {d.dataset.uploadedBy.name} on {formatDateTime(d.dataset.createdAt)} · compared with r{d.revision}
            {d.revision !== d.dataset.revision ? ` (uploaded against r${d.dataset.revision})` : ''}
          </p>
          {d.dataset.notes ? <p className="mt-1 text-xs text-ink-300">{d.dataset.notes}</p> : null}
        </div>
        <div className="flex gap-2">
          <a className="text-xs text-lagoon-100 underline" href={`/api/bench/${encodeURIComponent(d.dataset.id)}/file`} data-testid="bench-download">
            Raw file
          </a>
          {d.dataset.canDelete ? (
            <Button variant="danger" pending={del.isPending} pendingLabel="Deleting…" data-testid="bench-delete" onClick={() => del.mutate(d.dataset.id, { onSuccess: onDeleted })}>
              Delete
            </Button>
          ) : null}
        </div>
      </div>
      {del.error ? <Notice tone="error">{formError(del.error)}</Notice> : null}
      {c.ok ? (
        <>
          <Summary c={c} />
          <BenchPlot comparison={c} />
          <ErrorTable c={c} />
        </>
      ) : (
        <Notice tone="error" testId="bench-model-failed">
          The model could not be compared with r{d.revision}: {c.reason}
        </Notice>
      )}
    </div>
  );
}

/**
 * Bench data on the design page: upload a CSV of measurements on the built supply, map its
 * columns, and see them over the model of the shown revision with the error of every point.
 */
export function BenchPanel({ designId, revision, canUpload }: { designId: string; revision: number; canUpload: boolean }) {
  const list = useBenchDatasets(designId);
  const [chosen, setChosen] = useState<string | null>(null);
  const datasets = list.data?.datasets ?? [];
  const selected = chosen && datasets.some((d) => d.id === chosen) ? chosen : (datasets[0]?.id ?? null);
  return (
    <Panel title="Bench measurements" testId="bench-panel" actions={<Badge tone="live">compared with r{revision}</Badge>}>
      <div className="space-y-4">
        <Notice tone="caution" testId="bench-caution">
          {BENCH_CAUTION}
        </Notice>
        {canUpload ? <Uploader designId={designId} revision={revision} onSaved={(d) => setChosen(d.id)} /> : null}
        {list.isPending ? <Skeleton lines={2} /> : null}
        {list.isError ? <Notice tone="error">{formError(list.error)}</Notice> : null}
        {list.data && datasets.length === 0 ? <p className="text-sm text-ink-300">No measurements uploaded for this design yet.</p> : null}
        {datasets.length > 0 ? (
          <ul className="flex flex-wrap gap-2" aria-label="Bench datasets">
            {datasets.map((d) => (
              <li key={d.id}>
                <button
                  type="button"
                  onClick={() => setChosen(d.id)}
                  aria-pressed={d.id === selected}
                  data-testid="bench-dataset"
                  data-id={d.id}
                  className={`rounded-md border px-2.5 py-1 text-xs ${d.id === selected ? 'border-lagoon-400 bg-lagoon-800/40 text-lagoon-100' : 'border-ink-600 text-ink-200 hover:border-ink-400'}`}
                >
                  {d.name} <span className="text-ink-400">· {d.kind === 'loadCurve' ? 'load curve' : 'ripple'}</span>
                </button>
              </li>
            ))}
          </ul>
        ) : null}
        {selected ? <DatasetView key={selected} designId={designId} datasetId={selected} revision={revision} onDeleted={() => setChosen(null)} /> : null}
      </div>
    </Panel>
  );
}
