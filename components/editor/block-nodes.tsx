'use client';
/**
 * The canvas's custom node types, one per block kind, declared once at module scope and memo'd.
 * Each draws Kilorung's own symbols (components/editor/symbols.tsx) inside the block's size from
 * `blockSize`, and puts one handle on each port exactly at its `portAnchors` point, so the ports of
 * chained stages land on the same canvas points. Node data carries only plain values (the block,
 * its fault level, the parts over their derated limit); no functions. Each part symbol shows its
 * designator (lib/circuit/document/designators.ts), read from the editor's document: the map is
 * computed once per document object and shared by every node, and a node re-renders only when
 * one of its own designators changes.
 */
import { memo, useEffect, type FocusEvent as ReactFocusEvent, type KeyboardEvent as ReactKeyboardEvent, type PointerEvent as ReactPointerEvent } from 'react';
import { useStore } from 'zustand';
import { Handle, Position, useUpdateNodeInternals, type Node, type NodeProps, type NodeTypes } from '@xyflow/react';
import { portsOf, type DesignBlock } from '@/lib/circuit/document/schema';
import { blockSize, portAnchors, type PortAnchor } from '@/lib/circuit/document/geometry';
import { portWords } from '@/lib/circuit/document/connect';
import { designatorKey, designatorMap } from '@/lib/circuit/document/designators';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { formatSi } from '@/lib/client/format';
import type { PortKey } from '@/lib/editor/types';
import { BlockSvg, GroundGlyph, INK, Junction, Lead, LoadGlyph, PartOnSegment, SourceGlyph, type Pt } from './symbols';
import { useHoverApi } from './hover-store';
import { useEditorParts } from '@/components/parts/editor-parts-context';
import { diodeLabel } from '@/lib/parts/binding';
import { useEditor, useEditorApi } from './store-context';

const designatorCache = new WeakMap<DesignDocument, Map<string, string>>();

/** Designators of the whole document (one computation per document object). */
function designatorsOf(doc: DesignDocument): Map<string, string> {
  let m = designatorCache.get(doc);
  if (!m) {
    m = designatorMap(doc);
    designatorCache.set(doc, m);
  }
  return m;
}

/** The designators of one block's parts, by role, as a stable string (so the selector compares by value). */
function useDesignators(blockId: string, roles: readonly string[]): Record<string, string> {
  const joined = useEditor((s) => {
    const m = designatorsOf(s.document);
    return roles.map((r) => m.get(designatorKey(blockId, r)) ?? '').join(' ');
  });
  const list = joined.split(' ');
  return Object.fromEntries(roles.map((r, i) => [r, list[i] ?? ''] as const).filter(([, d]) => d !== ''));
}

const STAGE_ROLES = ['pumpC', 'pump2C', 'smoothC', 'diodeA', 'diodeB', 'diodeC', 'diodeD'] as const;

export interface BlockNodeData extends Record<string, unknown> {
  block: DesignBlock;
  /** Worst diagnostic on this block. */
  fault: 'error' | 'warning' | null;
  /** Roles of the block's parts that are past their derated limit (drawn in hazard red). */
  overRoles: string[];
}

export type BlockNode = Node<BlockNodeData, DesignBlock['kind']>;

const SIDE: Record<PortAnchor['side'], Position> = {
  left: Position.Left,
  right: Position.Right,
  top: Position.Top,
  bottom: Position.Bottom,
};

function anchorMap(block: DesignBlock): Record<string, Pt> {
  const m: Record<string, Pt> = {};
  for (const a of portAnchors(block)) m[a.port] = { x: a.x, y: a.y };
  return m;
}

/** One handle per port, centred on its anchor; hovering it asks for the net's reading. */
function Ports({ block }: { block: DesignBlock }) {
  const hover = useHoverApi();
  const editor = useEditorApi();
  const armed = useStore(hover, (s) => (s.armed?.startsWith(`${block.id}:`) ? s.armed : null));
  const onKey = (e: ReactKeyboardEvent, key: PortKey, port: string) => {
    if (e.key === 'Escape') {
      hover.getState().arm(null);
      return;
    }
    if (e.key !== 'Enter' && e.key !== ' ') return;
    e.preventDefault();
    e.stopPropagation();
    const first = hover.getState().armed;
    if (!first) return hover.getState().arm(key);
    hover.getState().arm(null);
    if (first === key) return;
    const i = first.indexOf(':');
    editor.getState().connect({ source: first.slice(0, i), sourcePort: first.slice(i + 1), target: block.id, targetPort: port });
  };
  return (
    <>
      {portAnchors(block).map((a) => {
        const key = `${block.id}:${a.port}` as PortKey;
        return (
          <Handle
            key={a.port}
            id={a.port}
            type="source"
            position={SIDE[a.side]}
            tabIndex={0}
            role="button"
            aria-pressed={armed === key}
            onKeyDown={(e: ReactKeyboardEvent) => onKey(e, key, a.port)}
            onFocus={(e: ReactFocusEvent<HTMLDivElement>) => {
              const r = e.currentTarget.getBoundingClientRect();
              hover.getState().setPort(key, { x: r.right, y: r.bottom });
            }}
            onBlur={() => hover.getState().setPort(null)}
            className={`kr-port ${armed === key ? 'kr-port--armed' : ''}`}
            style={{ left: a.x, top: a.y, right: 'auto', bottom: 'auto', transform: 'translate(-50%, -50%)' }}
            title={`${block.label ?? block.id}: ${portWords(a.port)}`}
            aria-label={`${block.label ?? block.id} ${portWords(a.port)}`}
            data-port={a.port}
            onPointerEnter={(e: ReactPointerEvent) => hover.getState().setPort(key, { x: e.clientX, y: e.clientY })}
            onPointerLeave={() => hover.getState().setPort(null)}
          />
        );
      })}
    </>
  );
}

/** The block's outer frame: size, test id, selection and fault rings, body hover. */
function Frame({ block, data, selected, children }: { block: DesignBlock; data: BlockNodeData; selected: boolean; children: React.ReactNode }) {
  const hover = useHoverApi();
  const { width, height } = blockSize(block);
  // A block whose ports change under the same id (half → full-wave, single → two-phase drive)
  // must have its handles measured again, or its new wires have nowhere to attach.
  const updateInternals = useUpdateNodeInternals();
  const ports = portsOf(block).join();
  useEffect(() => updateInternals(block.id), [updateInternals, block.id, ports]);
  const ring = data.fault === 'error' ? 'kr-block--error' : data.fault === 'warning' ? 'kr-block--warning' : '';
  return (
    <div
      className={`kr-block ${selected ? 'kr-block--selected' : ''} ${ring}`}
      style={{ width, height }}
      data-testid={`block-${block.id}`}
      data-kind={block.kind}
      data-fault={data.fault ?? undefined}
      onPointerEnter={(e) => hover.getState().setBlock(block.id, { x: e.clientX, y: e.clientY })}
      onPointerLeave={() => hover.getState().setBlock(null)}
    >
      {children}
      <Ports block={block} />
    </div>
  );
}

function Title({ text, x, y, anchor = 'start' }: { text: string; x: number; y: number; anchor?: 'start' | 'end' | 'middle' }) {
  return (
    <text x={x} y={y} fontSize={11} fontWeight={600} fill={INK.text} textAnchor={anchor}>
      {text}
    </text>
  );
}

const capLabel = (f: number) => formatSi(f, 'F');

function StageNodeView({ data, selected }: NodeProps<BlockNode>) {
  const block = data.block;
  const des = useDesignators(block.id, STAGE_ROLES);
  if (block.kind !== 'stage') return null;
  const d = block.data;
  const { width, height } = blockSize(block);
  const p = anchorMap(block);
  const over = new Set(data.overRoles);
  const neg = d.polarity === 'negative';
  const full = d.variant === 'full';
  // Internal junctions: where the diodes meet the columns (block-local px).
  const jxX = full ? 185 : 150;
  const jx = { x: jxX, y: p.xIn.y };
  const ky = { x: 14, y: p.yIn.y };
  const jy = { x: jxX, y: p.yIn.y };
  const j2 = full ? { x: 120, y: p.x2In.y } : null;
  const jy2 = full ? { x: 120, y: p.yIn.y } : null;
  const smoothEnd = full ? jy2! : jy;
  const diode = (from: Pt, to: Pt) => (neg ? { from: to, to: from } : { from, to });
  return (
    <Frame block={block} data={data} selected={selected}>
      <BlockSvg width={width} height={height}>
        <Title text={/[+−-]/.test(block.label ?? '') ? (block.label ?? block.id) : `${block.label ?? block.id} ${neg ? '−' : '+'}`} x={width - 6} y={12} anchor="end" />
        {/* driven column */}
        <PartOnSegment shape="capacitor" from={p.xIn} to={jx} label={capLabel(d.pumpC.capacitanceF)} labelSide={-1} fault={over.has('pumpC')} testId="sym-pumpC" designator={des.pumpC} />
        <Lead points={[jx, p.xOut]} />
        {/* second driven column (full-wave) */}
        {full && j2 && d.pump2C ? (
          <>
            <PartOnSegment shape="capacitor" from={p.x2In} to={j2} label={capLabel(d.pump2C.capacitanceF)} labelSide={-1} fault={over.has('pump2C')} testId="sym-pump2C" designator={des.pump2C} />
            <Lead points={[j2, p.x2Out]} />
          </>
        ) : null}
        {/* smoothing column */}
        <Lead points={[p.yIn, ky]} />
        <PartOnSegment shape="capacitor" from={ky} to={smoothEnd} label={capLabel(d.smoothC.capacitanceF)} labelSide={1} fault={over.has('smoothC')} testId="sym-smoothC" designator={des.smoothC} />
        <Lead points={[smoothEnd, p.yOut]} />
        {/* diodes: A from the smoothing input to the driven output, B from the driven output to the smoothing output */}
        {/* Diode part names and ratings are in the hover card and the inspector: on the drawing they would crowd the capacitor values. */}
        <PartOnSegment shape="diode" {...diode(ky, jx)} fault={over.has('diodeA')} testId="sym-diodeA" designator={des.diodeA} />
        <PartOnSegment shape="diode" {...diode(jx, jy)} fault={over.has('diodeB')} testId="sym-diodeB" designator={des.diodeB} />
        {full && j2 && jy2 ? (
          <>
            <PartOnSegment shape="diode" {...diode(ky, j2)} fault={over.has('diodeC')} testId="sym-diodeC" designator={des.diodeC} />
            <PartOnSegment shape="diode" {...diode(j2, jy2)} fault={over.has('diodeD')} testId="sym-diodeD" designator={des.diodeD} />
            <Junction at={j2} />
            <Junction at={jy2} />
          </>
        ) : null}
        <Junction at={jx} />
        <Junction at={ky} />
        <Junction at={jy} />
      </BlockSvg>
    </Frame>
  );
}

function SourceNodeView({ data, selected }: NodeProps<BlockNode>) {
  const block = data.block;
  if (block.kind !== 'acSource' && block.kind !== 'dcSource') return null;
  const { width, height } = blockSize(block);
  const p = anchorMap(block);
  const fault = data.fault === 'error';
  const cx = width / 2;
  let body: React.ReactNode;
  let lines: string[];
  if (block.kind === 'dcSource') {
    lines = [formatSi(block.data.voltageV, 'V')];
    body = (
      <>
        <Lead points={[p.pos, { x: cx, y: p.pos.y }, { x: cx, y: 52 }]} />
        <g stroke={INK.live} strokeWidth={2.4} strokeLinecap="round">
          <line x1={cx - 14} y1={54} x2={cx + 14} y2={54} />
          <line x1={cx - 7} y1={64} x2={cx + 7} y2={64} />
        </g>
        <Lead points={[{ x: cx, y: 66 }, p.neg]} />
      </>
    );
  } else {
    const a = block.data;
    lines = [`${formatSi(a.amplitudeV, 'V')} ${a.amplitudeMode === 'rms' ? 'rms' : 'pk'}`, formatSi(a.frequencyHz, 'Hz')];
    if (a.variant === 'single') {
      body = (
        <>
          <Lead points={[p.hot, { x: cx, y: p.hot.y }, { x: cx, y: 44 }]} />
          <SourceGlyph at={{ x: cx, y: 62 }} fault={fault} />
          <Lead points={[{ x: cx, y: 80 }, p.ret]} />
        </>
      );
    } else {
      // Two antiphase halves about the centre tap: hot above it, hotB below it.
      const tap = { x: cx, y: 78 };
      body = (
        <>
          <Lead points={[p.hot, { x: cx, y: p.hot.y }, { x: cx, y: 38 }]} />
          <SourceGlyph at={{ x: cx, y: 52 }} r={14} fault={fault} />
          <Lead points={[{ x: cx, y: 66 }, tap, { x: cx, y: 92 }]} />
          <SourceGlyph at={{ x: cx, y: 106 }} r={14} fault={fault} />
          <Lead points={[{ x: cx, y: 120 }, { x: cx, y: 130 }, { x: width - 24, y: 130 }, { x: width - 24, y: p.hotB.y }, p.hotB]} />
          <Lead points={[tap, { x: 24, y: tap.y }, { x: 24, y: 146 }, { x: cx, y: 146 }, p.ct]} />
          <Junction at={tap} />
        </>
      );
    }
  }
  return (
    <Frame block={block} data={data} selected={selected}>
      <BlockSvg width={width} height={height}>
        <Title text={block.label ?? block.id} x={6} y={12} />
        {body}
        {lines.map((l, i) => (
          <text key={l} x={width - 6} y={height - 26 + i * 13} fontSize={10.5} fill={INK.text} textAnchor="end" className="tabular-nums">
            {l}
          </text>
        ))}
      </BlockSvg>
    </Frame>
  );
}

function LoadNodeView({ data, selected }: NodeProps<BlockNode>) {
  const block = data.block;
  if (block.kind !== 'load') return null;
  const { width, height } = blockSize(block);
  const p = anchorMap(block);
  const top = { x: p.b.x, y: p.a.y };
  const label = block.data.mode === 'resistor' ? formatSi(block.data.resistanceOhm, 'Ω') : formatSi(block.data.currentA, 'A');
  return (
    <Frame block={block} data={data} selected={selected}>
      <BlockSvg width={width} height={height}>
        <Title text={block.label ?? block.id} x={width - 4} y={12} anchor="end" />
        <Lead points={[p.a, top]} />
        <Junction at={top} />
        <LoadGlyph a={top} b={p.b} mode={block.data.mode} label={label} fault={data.fault === 'error' || data.overRoles.length > 0} />
      </BlockSvg>
    </Frame>
  );
}

function GroundNodeView({ data, selected }: NodeProps<BlockNode>) {
  const block = data.block;
  const { width, height } = blockSize(block);
  return (
    <Frame block={block} data={data} selected={selected}>
      <BlockSvg width={width} height={height}>
        <GroundGlyph at={{ x: width / 2, y: 0 }} fault={data.fault === 'error'} />
      </BlockSvg>
    </Frame>
  );
}

const PART_ROLES = ['capacitor', 'diode', 'resistor'] as const;

function PartNodeView({ data, selected }: NodeProps<BlockNode>) {
  const block = data.block;
  const des = useDesignators(block.id, PART_ROLES);
  const designator = des[block.kind];
  const { width, height } = blockSize(block);
  const p = anchorMap(block);
  const over = data.overRoles.length > 0 || data.fault === 'error';
  const lib = useEditorParts();
  let part: React.ReactNode = null;
  if (block.kind === 'capacitor') part = <PartOnSegment shape="capacitor" from={p.a} to={p.b} label={capLabel(block.data.capacitanceF)} labelSide={-1} fault={over} designator={designator} />;
  else if (block.kind === 'resistor') part = <PartOnSegment shape="resistor" from={p.a} to={p.b} label={formatSi(block.data.resistanceOhm, 'Ω')} labelSide={-1} fault={over} designator={designator} />;
  else if (block.kind === 'diode') part = <PartOnSegment shape="diode" from={p.anode} to={p.cathode} label={diodeLabel(block.data, (id) => lib?.byId.get(id)?.partNumber)} labelSide={-1} fault={over} designator={designator} />;
  return (
    <Frame block={block} data={data} selected={selected}>
      <BlockSvg width={width} height={height}>
        <text x={width / 2} y={height - 4} fontSize={10} fill={INK.muted} textAnchor="middle">
          {block.label ?? block.id}
        </text>
        {part}
      </BlockSvg>
    </Frame>
  );
}

/** Node types by block kind (module scope, so xyflow never sees a new object). */
export const BLOCK_NODE_TYPES: NodeTypes = {
  stage: memo(StageNodeView),
  acSource: memo(SourceNodeView),
  dcSource: memo(SourceNodeView),
  load: memo(LoadNodeView),
  ground: memo(GroundNodeView),
  capacitor: memo(PartNodeView),
  resistor: memo(PartNodeView),
  diode: memo(PartNodeView),
};
