'use client';

import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { SolveView } from '@/lib/editor/types';
import { formatReading, voltScale } from '@/lib/editor/format';
import { niceTicks, warmupPlot } from './panel-model';

const axisTick = { fill: '#c9d1d7', fontSize: 10 };

/**
 * The output's rise from power-on: the output mean per cycle, with the 90 % level of the final
 * value and the cycle at which it is reached (t90).
 */
export function WarmupPlot({ warmup, outputLabel }: { warmup: NonNullable<SolveView['warmup']>; outputLabel: string }) {
  const last = warmup.curve.meanV[warmup.curve.meanV.length - 1] ?? 0;
  const vs = voltScale(Math.max(...warmup.curve.meanV.map(Math.abs), Math.abs(last)));
  const plot = warmupPlot(warmup, vs.factor);
  if (!plot) return <p className="text-xs text-ink-400">The warm-up run sent too few points to draw.</p>;
  const y = niceTicks(Math.min(0, ...plot.points.map((p) => p.v)), Math.max(plot.final, ...plot.points.map((p) => p.v)), 4);
  const fmtV = (v: number) => v.toFixed(y.decimals);
  return (
    <figure data-testid="warmup-plot" className="space-y-1">
      <div className="h-44 w-full" role="img" aria-label={`${outputLabel} from power-on, ${vs.unit} against cycles; 90 % reached after ${plot.cycles90 ?? 'unknown'} cycles`}>
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={plot.points} margin={{ top: 6, right: 10, bottom: 14, left: 4 }}>
            <CartesianGrid stroke="#232c33" />
            <XAxis
              type="number"
              dataKey="cycles"
              domain={[0, 'dataMax']}
              tick={axisTick}
              stroke="#46545f"
              label={{ value: 'cycles from power-on', position: 'insideBottom', offset: -8, fill: '#7d8b96', fontSize: 10 }}
            />
            <YAxis
              type="number"
              domain={y.domain}
              ticks={y.ticks}
              tick={axisTick}
              tickFormatter={fmtV}
              stroke="#46545f"
              width={52}
              label={{ value: vs.unit, angle: -90, position: 'insideLeft', fill: '#7d8b96', fontSize: 10 }}
            />
            <Tooltip
              contentStyle={{ background: '#141a1f', border: '1px solid #46545f', fontSize: 11 }}
              labelFormatter={(c) => `cycle ${Number(Number(c).toPrecision(4))}`}
              formatter={(v) => [`${Number(Number(v).toPrecision(4))} ${vs.unit}`, outputLabel]}
            />
            <ReferenceLine y={plot.level90} stroke="#e08a4c" strokeDasharray="4 3" label={{ value: '90 %', position: 'insideTopLeft', fill: '#e08a4c', fontSize: 10 }} />
            {plot.cycles90 !== null ? (
              <ReferenceLine x={plot.cycles90} stroke="#e08a4c" strokeDasharray="2 3" label={{ value: 't90', position: 'insideTopRight', fill: '#e08a4c', fontSize: 10 }} />
            ) : null}
            <Line dataKey="v" type="linear" dot={false} isAnimationActive={false} stroke="#2fa69b" strokeWidth={1.5} name={outputLabel} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-[11px] text-ink-200">
        90 % after {plot.cycles90 !== null ? `${Number(plot.cycles90.toPrecision(3))} cycles` : '—'} (t90 {formatReading(plot.t90S, 's', 3)}) · 99 % after{' '}
        {warmup.cycles99 !== null ? `${Number(warmup.cycles99.toPrecision(3))} cycles` : '—'} ({formatReading(warmup.t99S, 's', 3)})
      </figcaption>
    </figure>
  );
}
