'use client';

import { CartesianGrid, ComposedChart, Legend, Line, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import type { Comparison } from '@/lib/bench/compare';
import { overlaySeries } from '@/lib/bench/display';

const axisTick = { fill: '#c9d1d7', fontSize: 10 };
/** Model in lagoon teal (a result), measured points in copper (the built, live supply). */
const MODEL = '#2fa69b';
const MEASURED = '#e08a4c';

/** The model's curve with the measured points overlaid (load curve: V vs I; ripple: AC part vs t). */
export function BenchPlot({ comparison }: { comparison: Comparison }) {
  const s = overlaySeries(comparison);
  const ripple = comparison.kind === 'ripple';
  const xLabel = ripple ? `t from the first row (${s.x.unit})` : `load current (${s.x.unit})`;
  const yLabel = ripple ? `${s.y.unit} − mean` : `output (${s.y.unit})`;
  const fmt = (v: number) => `${Number(Number(v).toPrecision(4))}`;
  return (
    <figure data-testid="bench-plot" data-kind={comparison.kind} data-model-points={s.model.length} data-measured-points={s.measured.length} className="space-y-1">
      <div className="h-64 w-full" role="img" aria-label={`${ripple ? 'Ripple' : 'Load curve'}: model curve and ${comparison.points.length} measured points, ${yLabel} against ${xLabel}`}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart margin={{ top: 6, right: 12, bottom: 16, left: 6 }}>
            <CartesianGrid stroke="#232c33" />
            <XAxis type="number" dataKey="x" domain={['dataMin', 'dataMax']} tick={axisTick} tickFormatter={fmt} stroke="#46545f" label={{ value: xLabel, position: 'insideBottom', offset: -10, fill: '#7d8b96', fontSize: 10 }} />
            <YAxis type="number" dataKey="y" domain={['auto', 'auto']} tick={axisTick} tickFormatter={fmt} stroke="#46545f" width={60} label={{ value: yLabel, angle: -90, position: 'insideLeft', fill: '#7d8b96', fontSize: 10 }} />
            <Tooltip contentStyle={{ background: '#141a1f', border: '1px solid #46545f', fontSize: 11 }} formatter={(v, name) => [`${fmt(Number(v))} ${s.y.unit}`, name]} labelFormatter={(x) => `${fmt(Number(x))} ${s.x.unit}`} />
            <Legend verticalAlign="top" height={22} wrapperStyle={{ fontSize: 11, color: '#c9d1d7' }} />
            <Line data={s.model} dataKey="y" name="model" type="linear" dot={false} isAnimationActive={false} stroke={MODEL} strokeWidth={1.5} />
            <Scatter data={s.measured} dataKey="y" name="measured" fill={MEASURED} isAnimationActive={false} shape="circle" />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
