'use client';

import { useState } from 'react';
import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { NodeReading } from '@/lib/editor/types';
import { timeScale, voltScale } from '@/lib/editor/format';
import { maxAbsRipple, maxAbsVolts, niceTicks, seriesRange, waveformSeries } from './panel-model';

/** Series colours: teal for the first result, copper for the second, then light slate tones. */
export const SERIES_COLOURS = ['#2fa69b', '#e08a4c', '#c9d1d7', '#d8f1ef', '#fbe9dc', '#7d8b96'];

const axisTick = { fill: '#c9d1d7', fontSize: 10 };

/**
 * One period of the steady state for the given nodes, overlaid, each with its mean as a dashed
 * line; time in µs or ms, volts in V or kV as the values call for.
 */
export function WaveformPlot({ readings, periodS }: { readings: NodeReading[]; periodS: number }) {
  const [centred, setCentred] = useState(false);
  const ts = timeScale(periodS);
  const vs = voltScale(centred ? maxAbsRipple(readings) : maxAbsVolts(readings));
  const series = waveformSeries(readings, ts.factor, vs.factor, 600, centred);
  if (series.length === 0) return <p className="text-xs text-ink-400">The solve sent no waveform for these nodes.</p>;
  const [lo, hi] = seriesRange(series);
  const y = niceTicks(lo, hi, 4);
  const x = niceTicks(0, periodS * ts.factor, 5);
  const fmtT = (v: number) => `${Number(v.toPrecision(3))}`;
  const fmtV = (v: number) => v.toFixed(y.decimals);
  const fmtTip = (v: number) => v.toFixed(y.decimals + 1);
  return (
    <figure data-testid="waveform-plot" data-series={series.length} data-centred={centred ? 'true' : 'false'} className="space-y-1">
      <label className="flex items-center justify-end gap-1 text-[11px] text-ink-400">
        <input type="checkbox" checked={centred} onChange={(e) => setCentred(e.target.checked)} className="accent-lagoon-400" data-testid="waveform-centred" />
        ripple only (mean removed)
      </label>
      <div className="h-48 w-full" role="img" aria-label={`One period of ${series.map((s) => s.label).join(', ')}, volts in ${vs.unit} against time in ${ts.unit}`}>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 6, right: 10, bottom: 14, left: 4 }}>
            <CartesianGrid stroke="#232c33" />
            <XAxis
              type="number"
              dataKey="x"
              domain={[0, periodS * ts.factor]}
              ticks={x.ticks.filter((t) => t <= periodS * ts.factor * (1 + 1e-9))}
              allowDataOverflow
              tick={axisTick}
              tickFormatter={fmtT}
              stroke="#46545f"
              label={{ value: `t (${ts.unit})`, position: 'insideBottom', offset: -8, fill: '#7d8b96', fontSize: 10 }}
            />
            <YAxis
              type="number"
              dataKey="y"
              domain={y.domain}
              ticks={y.ticks}
              tick={axisTick}
              tickFormatter={fmtV}
              stroke="#46545f"
              width={y.decimals > 2 ? 64 : 52}
              label={{ value: centred ? `${vs.unit} − mean` : vs.unit, angle: -90, position: 'insideLeft', fill: '#7d8b96', fontSize: 10 }}
            />
            <Tooltip
              contentStyle={{ background: '#141a1f', border: '1px solid #46545f', fontSize: 11 }}
              labelFormatter={(t) => `t = ${fmtT(Number(t))} ${ts.unit}`}
              formatter={(v, name) => [`${fmtTip(Number(v))} ${vs.unit}`, name]}
            />
            {series.map((s, i) => (
              <ReferenceLine key={`${s.node}-mean`} y={s.mean} stroke={SERIES_COLOURS[i % SERIES_COLOURS.length]} strokeDasharray="4 3" strokeOpacity={0.7} />
            ))}
            {series.map((s, i) => (
              <Line
                key={s.node}
                data={s.points}
                dataKey="y"
                name={s.label}
                type="linear"
                dot={false}
                isAnimationActive={false}
                stroke={SERIES_COLOURS[i % SERIES_COLOURS.length]}
                strokeWidth={1.5}
              />
            ))}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="flex flex-wrap gap-x-3 gap-y-0.5 text-[11px] text-ink-200">
        {series.map((s, i) => (
          <span key={s.node} className="inline-flex items-center gap-1">
            <span aria-hidden="true" className="inline-block h-0.5 w-3" style={{ background: SERIES_COLOURS[i % SERIES_COLOURS.length] }} />
            {s.label}
          </span>
        ))}
        <span className="text-ink-400">{centred ? 'each node about its own mean' : 'dashed: mean'}</span>
      </figcaption>
    </figure>
  );
}
