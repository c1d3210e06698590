'use client';
/**
 * Plots of a finished analysis: a sweep as output DC, ripple peak-to-peak and worst stress margin
 * against the swept parameter (the stage sweep's optimum marked), a spread as histograms of output
 * DC and ripple with their 5th, 50th and 95th percentiles marked, and a table of the figures.
 */
import { Bar, CartesianGrid, ComposedChart, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { PARAMETER_INFO, type SweepParameter } from '@/lib/analyses/spec';
import type { PointResult, SpreadResult, SweepResult } from '@/lib/analyses/run';
import type { Distribution } from '@/lib/analyses/stats';
import { formatSi } from '@/lib/client/format';
import { voltScale } from '@/lib/editor/format';

const axisTick = { fill: '#c9d1d7', fontSize: 10 };
const tooltipStyle = { background: '#141a1f', border: '1px solid #46545f', fontSize: 11 };
const num = (v: number, digits = 4) => Number(v.toPrecision(digits));

/** The swept value as the axis and table show it. */
export function parameterText(parameter: SweepParameter, v: number): string {
  return parameter === 'stages' ? `${v}` : formatSi(v, PARAMETER_INFO[parameter].unit);
}

type Ok = Extract<PointResult, { ok: true }>;

function SweepChart({ title, testId, data, yKey, unit, parameter, optimum, colour, logX }: {
  title: string;
  testId: string;
  data: Array<Record<string, number | null>>;
  yKey: string;
  unit: string;
  parameter: SweepParameter;
  optimum: number | null;
  colour: string;
  logX: boolean;
}) {
  const info = PARAMETER_INFO[parameter];
  return (
    <figure className="space-y-1" data-testid={testId}>
      <figcaption className="text-xs font-medium text-ink-200">{title}</figcaption>
      <div className="h-40 w-full" role="img" aria-label={`${title} against ${info.label.toLowerCase()}`}>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 6, right: 12, bottom: 14, left: 4 }}>
            <CartesianGrid stroke="#232c33" />
            <XAxis
              type="number"
              dataKey="x"
              scale={logX ? 'log' : 'auto'}
              domain={['dataMin', 'dataMax']}
              allowDecimals={parameter !== 'stages'}
              tick={axisTick}
              tickFormatter={(v: number) => parameterText(parameter, v)}
              stroke="#46545f"
              label={{ value: info.label.toLowerCase(), position: 'insideBottom', offset: -8, fill: '#7d8b96', fontSize: 10 }}
            />
            <YAxis type="number" domain={['auto', 'auto']} tick={axisTick} tickFormatter={(v: number) => `${num(v, 3)}`} stroke="#46545f" width={52} label={{ value: unit, angle: -90, position: 'insideLeft', fill: '#7d8b96', fontSize: 10 }} />
            <Tooltip contentStyle={tooltipStyle} labelFormatter={(x) => parameterText(parameter, Number(x))} formatter={(v) => [`${num(Number(v))} ${unit}`, title]} />
            {optimum !== null ? <ReferenceLine x={optimum} stroke="#e08a4c" strokeDasharray="4 3" label={{ value: `optimum n = ${optimum}`, position: 'insideTopRight', fill: '#e08a4c', fontSize: 10 }} /> : null}
            <Line dataKey={yKey} type="linear" isAnimationActive={false} stroke={colour} strokeWidth={1.5} dot={{ r: 2 }} connectNulls={false} name={title} />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}

export function SweepPlots({ result, logX }: { result: SweepResult; logX: boolean }) {
  const ok = result.points.filter((p): p is Ok => p.ok);
  const vs = voltScale(Math.max(0, ...ok.map((p) => Math.abs(p.outputDcV))));
  const rs = voltScale(Math.max(0, ...ok.map((p) => Math.abs(p.rippleV ?? 0))));
  const data = result.points.map((p) => ({
    x: p.value,
    out: p.ok ? p.outputDcV * vs.factor : null,
    ripple: p.ok && p.rippleV !== null ? p.rippleV * rs.factor : null,
    margin: p.ok && p.worstMargin !== null ? p.worstMargin * 100 : null,
  }));
  const optimum = result.optimum?.value ?? null;
  const failed = result.points.filter((p): p is Extract<PointResult, { ok: false }> => !p.ok);
  return (
    <div className="space-y-3" data-testid="sweep-result">
      {result.parameter === 'stages' ? (
        <p className="text-sm text-ink-100" data-testid="analysis-optimum">
          {result.optimum ? (
            <>
              Highest output at <strong className="text-copper-400">n = {result.optimum.value}</strong> stages: {formatSi(result.optimum.outputDcV, 'V')}. The textbook optimum √(Vp·f·C/I) gives about the same; real designs
              stay well below it, where regulation is better.
            </>
          ) : (
            'No stage count solved, so there is no optimum.'
          )}
        </p>
      ) : null}
      <div className="grid gap-3 md:grid-cols-3">
        <SweepChart title="Output DC" testId="sweep-plot-output" data={data} yKey="out" unit={vs.unit} parameter={result.parameter} optimum={optimum} colour="#2fa69b" logX={logX} />
        <SweepChart title="Ripple p-p" testId="sweep-plot-ripple" data={data} yKey="ripple" unit={rs.unit} parameter={result.parameter} optimum={optimum} colour="#e08a4c" logX={logX} />
        <SweepChart title="Worst stress margin" testId="sweep-plot-margin" data={data} yKey="margin" unit="%" parameter={result.parameter} optimum={optimum} colour="#d8f1ef" logX={logX} />
      </div>
      <table className="w-full text-left text-xs text-ink-200" data-testid="sweep-table">
        <thead className="text-ink-400">
          <tr>
            <th className="py-1 pr-2 font-medium">{PARAMETER_INFO[result.parameter].label}</th>
            <th className="py-1 pr-2 font-medium">Output DC</th>
            <th className="py-1 pr-2 font-medium">Ripple p-p</th>
            <th className="py-1 pr-2 font-medium">Worst margin</th>
          </tr>
        </thead>
        <tbody>
          {result.points.map((p) => (
            <tr key={p.index} className={p.ok && p.value === optimum ? 'text-copper-100' : ''}>
              <td className="py-0.5 pr-2">{parameterText(result.parameter, p.value)}</td>
              {p.ok ? (
                <>
                  <td className="py-0.5 pr-2">{formatSi(p.outputDcV, 'V')}</td>
                  <td className="py-0.5 pr-2">{p.rippleV === null ? '—' : formatSi(p.rippleV, 'V')}</td>
                  <td className={`py-0.5 pr-2 ${p.worstMargin !== null && p.worstMargin < 0 ? 'text-hazard-100' : ''}`}>
                    {p.worstMargin === null ? 'no ratings' : `${num(p.worstMargin * 100, 3)} %${p.worstPart ? ` (${p.worstPart})` : ''}`}
                  </td>
                </>
              ) : (
                <td colSpan={3} className="py-0.5 pr-2 text-hazard-100">
                  failed: {p.reason}
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
      {failed.length > 0 ? <p className="text-xs text-hazard-100">{failed.length} point(s) did not solve and are left out of the plots.</p> : null}
    </div>
  );
}

function Histogram({ title, testId, d }: { title: string; testId: string; d: Distribution }) {
  const s = voltScale(Math.max(Math.abs(d.max), Math.abs(d.min)));
  const data = d.histogram.map((b) => ({ x: ((b.from + b.to) / 2) * s.factor, count: b.count }));
  const pad = d.histogram.length > 0 ? ((d.histogram[0].to - d.histogram[0].from) / 2) * s.factor : 0;
  const marks: Array<[string, number]> = [
    ['p5', d.p5],
    ['p50', d.p50],
    ['p95', d.p95],
  ];
  return (
    <figure className="space-y-1" data-testid={testId}>
      <figcaption className="text-xs font-medium text-ink-200">{title}</figcaption>
      <div className="h-44 w-full" role="img" aria-label={`${title}: histogram of ${d.n} samples, 5th percentile ${formatSi(d.p5, 'V')}, median ${formatSi(d.p50, 'V')}, 95th percentile ${formatSi(d.p95, 'V')}`}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} margin={{ top: 14, right: 12, bottom: 14, left: 4 }} barCategoryGap={1}>
            <CartesianGrid stroke="#232c33" />
            <XAxis
              type="number"
              dataKey="x"
              domain={[d.min * s.factor - pad, d.max * s.factor + pad]}
              tick={axisTick}
              tickFormatter={(v: number) => `${num(v, 4)}`}
              stroke="#46545f"
              label={{ value: s.unit, position: 'insideBottom', offset: -8, fill: '#7d8b96', fontSize: 10 }}
            />
            <YAxis type="number" allowDecimals={false} tick={axisTick} stroke="#46545f" width={32} label={{ value: 'samples', angle: -90, position: 'insideLeft', fill: '#7d8b96', fontSize: 10 }} />
            <Tooltip contentStyle={tooltipStyle} labelFormatter={(x) => `${num(Number(x))} ${s.unit}`} formatter={(v) => [`${v}`, 'samples']} />
            <Bar dataKey="count" fill="#1b7c73" isAnimationActive={false} />
            {marks.map(([label, v]) => (
              <ReferenceLine key={label} x={v * s.factor} stroke="#e08a4c" strokeDasharray={label === 'p50' ? undefined : '4 3'} label={{ value: label, position: 'top', fill: '#e08a4c', fontSize: 10 }} />
            ))}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}

const ROWS: Array<[keyof Distribution, string]> = [
  ['mean', 'Mean'],
  ['std', 'Std deviation'],
  ['p5', '5th percentile'],
  ['p50', 'Median (p50)'],
  ['p95', '95th percentile'],
  ['min', 'Lowest'],
  ['max', 'Highest'],
];

export function SpreadPlots({ result }: { result: SpreadResult }) {
  if (!result.output) return <p className="text-sm text-hazard-100">No sample solved, so there is no spread to show.</p>;
  return (
    <div className="space-y-3" data-testid="spread-result">
      <div className="grid gap-3 md:grid-cols-2">
        <Histogram title="Output DC" testId="spread-plot-output" d={result.output} />
        {result.ripple ? <Histogram title="Ripple p-p" testId="spread-plot-ripple" d={result.ripple} /> : null}
      </div>
      <table className="w-full max-w-xl text-left text-xs text-ink-200" data-testid="spread-table">
        <thead className="text-ink-400">
          <tr>
            <th className="py-1 pr-2 font-medium">{result.output.n} samples</th>
            <th className="py-1 pr-2 font-medium">Output DC</th>
            <th className="py-1 pr-2 font-medium">Ripple p-p</th>
          </tr>
        </thead>
        <tbody>
          {ROWS.map(([key, label]) => (
            <tr key={key}>
              <th scope="row" className="py-0.5 pr-2 font-normal text-ink-400">
                {label}
              </th>
              <td className="py-0.5 pr-2" data-testid={`spread-output-${key}`} data-value={String(result.output![key])}>
                {formatSi(result.output![key] as number, 'V')}
              </td>
              <td className="py-0.5 pr-2" data-testid={`spread-ripple-${key}`}>
                {result.ripple ? formatSi(result.ripple[key] as number, 'V') : '—'}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {result.failed > 0 ? <p className="text-xs text-hazard-100">{result.failed} sample(s) did not solve and are left out.</p> : null}
    </div>
  );
}
