/**
 * A read-only drawing of one side of a comparison: every block as a box at its document position
 * and size (`blockSize`), wires between the port anchors the editor uses (`portPosition`), each
 * block's designator as on the canvas, and the blocks that differ marked three ways at once —
 * outline pattern, a text tag and a colour — so the marks read without colour (never a
 * red/green pair): added = solid heavy teal outline and "+ added"; removed = dashed copper
 * outline over hatching and "− removed"; changed = dotted light outline with a second inner
 * outline and "~ changed". Wires only on one side are drawn heavy and dashed in that side's
 * added (teal, after) or removed (copper, before) colour.
 */
import type { DesignBlock, DesignDocument } from '@/lib/circuit/document/schema';
import { blockSize, portPosition } from '@/lib/circuit/document/geometry';
import { designatorOf, formatFieldValue, type ChangeKind } from '@/lib/compare';

/** Tag text of each change kind (also used by the tables and the legend). */
export const CHANGE_TAG: Record<ChangeKind, string> = { added: '+ added', removed: '− removed', changed: '~ changed' };

/** Outline of each change kind: Tailwind stroke colour and dash pattern. */
const OUTLINE: Record<ChangeKind, { className: string; dash?: string; width: number }> = {
  added: { className: 'stroke-lagoon-400', width: 4 },
  removed: { className: 'stroke-copper-400', dash: '10 5', width: 3 },
  changed: { className: 'stroke-ink-50', dash: '2 4', width: 3 },
};

/** Margin around the drawing (px), room for the change tags above the top row. */
const PAD = 48;

function valueLine(block: DesignBlock): string {
  switch (block.kind) {
    case 'stage':
      return `${formatFieldValue('capacitanceF', block.data.pumpC.capacitanceF)} / ${formatFieldValue('capacitanceF', block.data.smoothC.capacitanceF)}`;
    case 'acSource':
      return `${formatFieldValue('amplitudeV', block.data.amplitudeV)} ${block.data.amplitudeMode === 'rms' ? 'rms' : 'pk'} · ${formatFieldValue('frequencyHz', block.data.frequencyHz)}`;
    case 'dcSource':
      return formatFieldValue('voltageV', block.data.voltageV);
    case 'load':
      return block.data.mode === 'resistor' ? formatFieldValue('resistanceOhm', block.data.resistanceOhm) : formatFieldValue('currentA', block.data.currentA);
    case 'capacitor':
      return formatFieldValue('capacitanceF', block.data.capacitanceF);
    case 'resistor':
      return formatFieldValue('resistanceOhm', block.data.resistanceOhm);
    case 'diode':
      return block.data.ratedPivV ? `PIV ${formatFieldValue('ratedPivV', block.data.ratedPivV)}` : 'diode';
    case 'ground':
      return '';
  }
}

/** The hatching removed blocks are filled with (one pattern per drawing, id made unique by `idPrefix`). */
function Hatch({ id }: { id: string }) {
  return (
    <pattern id={id} width={8} height={8} patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
      <line x1={0} y1={0} x2={0} y2={8} className="stroke-copper-600" strokeWidth={2} />
    </pattern>
  );
}

function Block({ block, change, hatchId }: { block: DesignBlock; change: ChangeKind | undefined; hatchId: string }) {
  const { width, height } = blockSize(block);
  const { x, y } = block.position;
  const o = change ? OUTLINE[change] : null;
  const values = valueLine(block);
  return (
    <g data-testid="compare-block" data-block={block.id} data-change={change ?? 'same'}>
      <rect x={x} y={y} width={width} height={height} rx={6} className="fill-ink-800 stroke-ink-600" strokeWidth={1.5} />
      {change === 'removed' ? <rect x={x} y={y} width={width} height={height} rx={6} fill={`url(#${hatchId})`} opacity={0.35} /> : null}
      {o ? <rect x={x - 4} y={y - 4} width={width + 8} height={height + 8} rx={9} fill="none" className={o.className} strokeWidth={o.width} strokeDasharray={o.dash} /> : null}
      {change === 'changed' ? <rect x={x + 4} y={y + 4} width={width - 8} height={height - 8} rx={4} fill="none" className="stroke-ink-50" strokeWidth={1} /> : null}
      <text x={x + 8} y={y + 24} fontSize={Math.min(20, width / 4)} fontWeight={600} className="fill-ink-50">
        {designatorOf(block)}
      </text>
      {values ? (
        <text x={x + 8} y={y + height - 10} fontSize={Math.max(12, Math.min(16, width / 8))} className="fill-ink-200">
          {values}
        </text>
      ) : null}
      {change ? (
        <text x={x + width} y={y - 12} fontSize={18} fontWeight={700} textAnchor="end" className={change === 'added' ? 'fill-lagoon-400' : change === 'removed' ? 'fill-copper-400' : 'fill-ink-50'}>
          {CHANGE_TAG[change]}
        </text>
      ) : null}
    </g>
  );
}

/** The extent of a document's blocks (px); a 200 × 100 box at the origin for an empty drawing. */
export function drawingBounds(document: DesignDocument): { minX: number; minY: number; maxX: number; maxY: number } {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const b of document.blocks) {
    const { width, height } = blockSize(b);
    minX = Math.min(minX, b.position.x);
    minY = Math.min(minY, b.position.y);
    maxX = Math.max(maxX, b.position.x + width);
    maxY = Math.max(maxY, b.position.y + height);
  }
  if (!Number.isFinite(minX)) return { minX: 0, minY: 0, maxX: 200, maxY: 100 };
  return { minX, minY, maxX, maxY };
}

/** Width over height of a drawing with its margin. */
export function drawingAspect(document: DesignDocument): number {
  const { minX, minY, maxX, maxY } = drawingBounds(document);
  return (maxX - minX + 2 * PAD) / (maxY - minY + 2 * PAD);
}

/** One side's drawing, scaled to its container's width. */
export function CompareDrawing({
  document,
  highlight,
  wiresOnlyHere,
  title,
  side,
}: {
  document: DesignDocument;
  highlight: Record<string, ChangeKind>;
  /** Wires the other side does not have: drawn heavier and dashed, in the side's added/removed colour. */
  wiresOnlyHere: readonly string[];
  title: string;
  side: 'a' | 'b';
}) {
  const marked = new Set(wiresOnlyHere);
  const byId = new Map(document.blocks.map((b) => [b.id, b] as const));
  const { minX, minY, maxX, maxY } = drawingBounds(document);
  const viewBox = `${minX - PAD} ${minY - PAD} ${maxX - minX + 2 * PAD} ${maxY - minY + 2 * PAD}`;
  const hatchId = `compare-hatch-${side}`;
  return (
    <figure className="min-w-0" data-testid="compare-drawing" data-side={side}>
      <figcaption className="mb-1 text-sm font-medium text-ink-100">{title}</figcaption>
      <svg viewBox={viewBox} role="img" aria-label={`Drawing of ${title}`} className="h-auto w-full rounded-md border border-ink-800 bg-ink-900">
        <defs>
          <Hatch id={hatchId} />
        </defs>
        {document.wires.map((w) => {
          const s = byId.get(w.source);
          const t = byId.get(w.target);
          const p = s ? portPosition(s, w.sourcePort) : null;
          const q = t ? portPosition(t, w.targetPort) : null;
          if (!p || !q) return null;
          const midX = (p.x + q.x) / 2;
          const only = marked.has(w.id);
          return (
            <polyline
              key={w.id}
              points={`${p.x},${p.y} ${midX},${p.y} ${midX},${q.y} ${q.x},${q.y}`}
              fill="none"
              className={only ? (side === 'b' ? 'stroke-lagoon-400' : 'stroke-copper-400') : 'stroke-ink-400'}
              strokeWidth={only ? 4 : 1.5}
              strokeDasharray={only ? '12 6' : undefined}
              data-testid={only ? 'compare-wire-only-here' : undefined}
              data-wire={w.id}
            />
          );
        })}
        {document.blocks.map((b) => (
          <Block key={b.id} block={b} change={highlight[b.id]} hatchId={hatchId} />
        ))}
        {document.blocks.length === 0 ? (
          <text x={minX} y={minY + 20} fontSize={14} className="fill-ink-400">
            Empty drawing
          </text>
        ) : null}
      </svg>
    </figure>
  );
}

/** The key to the marks, with the same patterns and words as the drawings. */
export function CompareLegend() {
  const kinds: ChangeKind[] = ['added', 'removed', 'changed'];
  return (
    <ul className="flex flex-wrap gap-4 text-xs text-ink-200" data-testid="compare-legend" aria-label="Key to the marks on the drawings">
      {kinds.map((k) => (
        <li key={k} className="flex items-center gap-2">
          <svg width={34} height={18} viewBox="0 0 34 18" aria-hidden="true">
            {k === 'removed' ? (
              <>
                <defs>
                  <Hatch id="compare-hatch-legend" />
                </defs>
                <rect x={3} y={3} width={28} height={12} fill="url(#compare-hatch-legend)" opacity={0.35} />
              </>
            ) : null}
            <rect x={3} y={3} width={28} height={12} rx={3} fill="none" className={OUTLINE[k].className} strokeWidth={OUTLINE[k].width / 1.5} strokeDasharray={OUTLINE[k].dash} />
            {k === 'changed' ? <rect x={6} y={6} width={22} height={6} rx={2} fill="none" className="stroke-ink-50" strokeWidth={0.8} /> : null}
          </svg>
          <span>
            <strong className="font-semibold text-ink-50">{CHANGE_TAG[k]}</strong>
            {k === 'added' ? ' — only in the newer side (after)' : k === 'removed' ? ' — only in the older side (before)' : ' — values differ'}
          </span>
        </li>
      ))}
      <li className="flex items-center gap-2">
        <svg width={34} height={18} viewBox="0 0 34 18" aria-hidden="true">
          <line x1={2} y1={6} x2={32} y2={6} className="stroke-lagoon-400" strokeWidth={2.5} strokeDasharray="7 3" />
          <line x1={2} y1={13} x2={32} y2={13} className="stroke-copper-400" strokeWidth={2.5} strokeDasharray="7 3" />
        </svg>
        <span>
          <strong className="font-semibold text-ink-50">heavy dashed wire</strong> — a wire only on that side
        </span>
      </li>
    </ul>
  );
}
