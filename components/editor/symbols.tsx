/**
 * Kilorung's own schematic symbols, drawn in SVG in block-local canvas px. Each two-terminal
 * part is drawn along the segment between its two connection points: leads to the body, the body
 * centred on the segment and turned with it, and the value beside it (never turned, so it reads).
 * Colours: copper for parts that carry the high voltage, ink for leads, hazard red for a fault.
 */
import type { ReactNode } from 'react';

export interface Pt {
  x: number;
  y: number;
}

export type PartShape = 'capacitor' | 'diode' | 'resistor';

/** Stroke colours of the drawing (match tailwind.config.ts). */
export const INK = {
  lead: '#7d8b96',
  live: '#e08a4c',
  liveFill: '#7a3a10',
  text: '#c9d1d7',
  muted: '#7d8b96',
  fault: '#d93a3a',
  result: '#2fa69b',
};

/** Half the length of each part body along its segment (px). */
const BODY: Record<PartShape, number> = { capacitor: 5, diode: 9, resistor: 14 };

function Body({ shape, color }: { shape: PartShape; color: string }) {
  switch (shape) {
    case 'capacitor':
      return (
        <g stroke={color} strokeWidth={2.6} strokeLinecap="round">
          <line x1={-5} y1={-11} x2={-5} y2={11} />
          <line x1={5} y1={-11} x2={5} y2={11} />
        </g>
      );
    case 'diode':
      // Anode at −x, cathode at +x: a notched wedge pointing at the cathode bar.
      return (
        <g stroke={color} strokeWidth={2} strokeLinejoin="round">
          <path d="M -9 -9 L 7 0 L -9 9 L -5 0 Z" fill={INK.liveFill} />
          <line x1={8} y1={-9} x2={8} y2={9} strokeWidth={2.6} strokeLinecap="round" />
        </g>
      );
    case 'resistor':
      return <rect x={-14} y={-5.5} width={28} height={11} rx={5.5} fill="none" stroke={color} strokeWidth={2.2} />;
  }
}

/**
 * A part drawn from `from` to `to`. For a diode `from` is the anode. `label` sits at the side
 * given by `labelSide` (+1 / −1 perpendicular to the segment, counter-clockwise first); the
 * part's `designator` (C1, D3 … from lib/circuit/document/designators.ts) sits on the other side,
 * in small result-teal text, with `data-testid="designator-<designator>"`.
 */
export function PartOnSegment({
  shape,
  from,
  to,
  label,
  labelSide = 1,
  fault = false,
  testId,
  designator,
}: {
  shape: PartShape;
  from: Pt;
  to: Pt;
  label?: string;
  labelSide?: 1 | -1;
  fault?: boolean;
  testId?: string;
  designator?: string;
}) {
  const dx = to.x - from.x;
  const dy = to.y - from.y;
  const len = Math.hypot(dx, dy);
  const deg = (Math.atan2(dy, dx) * 180) / Math.PI;
  const mx = (from.x + to.x) / 2;
  const my = (from.y + to.y) / 2;
  const s = Math.min(BODY[shape], len / 2);
  const color = fault ? INK.fault : INK.live;
  // Unit normal, for the label offset.
  const nx = len > 0 ? -dy / len : 0;
  const ny = len > 0 ? dx / len : -1;
  const off = shape === 'resistor' ? 14 : 18;
  const lx = mx + nx * off * labelSide;
  const ly = my + ny * off * labelSide;
  const anchor = Math.abs(nx) < 0.3 ? 'middle' : nx * labelSide > 0 ? 'start' : 'end';
  // the designator on the side away from the value label, a little closer to the body
  const doff = shape === 'resistor' ? 12 : 15;
  const dx2 = mx - nx * doff * labelSide;
  const dy2 = my - ny * doff * labelSide;
  const danchor = Math.abs(nx) < 0.3 ? 'middle' : nx * labelSide > 0 ? 'end' : 'start';
  return (
    <g data-testid={testId}>
      <g transform={`translate(${mx} ${my}) rotate(${deg})`}>
        <line x1={-len / 2} y1={0} x2={-s} y2={0} stroke={INK.lead} strokeWidth={1.6} />
        <line x1={s} y1={0} x2={len / 2} y2={0} stroke={INK.lead} strokeWidth={1.6} />
        <Body shape={shape} color={color} />
      </g>
      {designator ? (
        <text x={dx2} y={dy2} dy="0.35em" textAnchor={danchor} fontSize={8.5} fontWeight={600} fill={INK.result} data-testid={`designator-${designator}`} data-designator={designator}>
          {designator}
        </text>
      ) : null}
      {label ? (
        <text x={lx} y={ly} dy="0.35em" textAnchor={anchor} fontSize={10.5} fill={INK.text} className="tabular-nums">
          {label}
        </text>
      ) : null}
    </g>
  );
}

/** A plain lead (wire inside a block) through the given points. */
export function Lead({ points, color = INK.lead }: { points: Pt[]; color?: string }) {
  return <polyline points={points.map((p) => `${p.x},${p.y}`).join(' ')} fill="none" stroke={color} strokeWidth={1.6} strokeLinejoin="round" />;
}

/** A junction dot where three or more leads meet. */
export function Junction({ at, color = INK.lead }: { at: Pt; color?: string }) {
  return <circle cx={at.x} cy={at.y} r={2.6} fill={color} />;
}

/** The AC drive: a ring with one sine period inside; `tapped` adds the centre-tap mark. */
export function SourceGlyph({ at, r = 18, tapped = false, fault = false }: { at: Pt; r?: number; tapped?: boolean; fault?: boolean }) {
  const color = fault ? INK.fault : INK.live;
  const w = r * 1.1;
  const h = r * 0.45;
  const d = `M ${at.x - w / 2} ${at.y} C ${at.x - w / 4} ${at.y - h * 1.6}, ${at.x - w / 4} ${at.y - h * 1.6}, ${at.x} ${at.y} S ${at.x + w / 4} ${at.y + h * 1.6}, ${at.x + w / 2} ${at.y}`;
  return (
    <g>
      <circle cx={at.x} cy={at.y} r={r} fill="#141a1f" stroke={color} strokeWidth={2.2} />
      <path d={d} fill="none" stroke={color} strokeWidth={1.8} strokeLinecap="round" />
      {tapped ? <circle cx={at.x} cy={at.y + r} r={3} fill={color} /> : null}
    </g>
  );
}

/** The ground reference: a stem and three shortening bars below `at`. */
export function GroundGlyph({ at, fault = false }: { at: Pt; fault?: boolean }) {
  const color = fault ? INK.fault : INK.lead;
  return (
    <g stroke={color} strokeWidth={2.2} strokeLinecap="round">
      <line x1={at.x} y1={at.y} x2={at.x} y2={at.y + 12} />
      <line x1={at.x - 14} y1={at.y + 12} x2={at.x + 14} y2={at.y + 12} />
      <line x1={at.x - 9} y1={at.y + 18} x2={at.x + 9} y2={at.y + 18} />
      <line x1={at.x - 4} y1={at.y + 24} x2={at.x + 4} y2={at.y + 24} />
    </g>
  );
}

/** A load between `a` and `b`: a resistor body, or a ring with an arrow for a constant current. */
export function LoadGlyph({ a, b, mode, label, fault = false }: { a: Pt; b: Pt; mode: 'resistor' | 'current'; label: string; fault?: boolean }) {
  if (mode === 'resistor') return <PartOnSegment shape="resistor" from={a} to={b} label={label} fault={fault} />;
  const color = fault ? INK.fault : INK.live;
  const mx = (a.x + b.x) / 2;
  const my = (a.y + b.y) / 2;
  const deg = (Math.atan2(b.y - a.y, b.x - a.x) * 180) / Math.PI;
  const len = Math.hypot(b.x - a.x, b.y - a.y);
  return (
    <g>
      <g transform={`translate(${mx} ${my}) rotate(${deg})`}>
        <line x1={-len / 2} y1={0} x2={-13} y2={0} stroke={INK.lead} strokeWidth={1.6} />
        <line x1={13} y1={0} x2={len / 2} y2={0} stroke={INK.lead} strokeWidth={1.6} />
        <circle r={13} fill="#141a1f" stroke={color} strokeWidth={2.2} />
        <path d="M -7 0 L 6 0 M 2 -4 L 7 0 L 2 4" fill="none" stroke={color} strokeWidth={1.8} strokeLinecap="round" strokeLinejoin="round" />
      </g>
      <text x={mx + 20} y={my} dy="0.35em" fontSize={10.5} fill={INK.text} className="tabular-nums">
        {label}
      </text>
    </g>
  );
}

/** The block's SVG surface, sized to the block. */
export function BlockSvg({ width, height, children }: { width: number; height: number; children: ReactNode }) {
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} className="pointer-events-none absolute inset-0 overflow-visible" aria-hidden="true">
      {children}
    </svg>
  );
}
