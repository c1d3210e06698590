'use client';
/**
 * The tray of blocks: drag an item onto the canvas (HTML5 drag and drop), or press it (click,
 * Enter or Space) to place it at the middle of the current view. Each item shows a small
 * thumbnail in the canvas's own symbols.
 */
import { TRAY_ITEMS, type TrayItem, type TrayItemKey } from '@/lib/circuit/document/tray';
import { GroundGlyph, INK, PartOnSegment, SourceGlyph } from './symbols';
import { TRAY_MIME } from './editor-canvas';

const GROUPS: { key: TrayItem['group']; title: string }[] = [
  { key: 'drive', title: 'Drive' },
  { key: 'ladder', title: 'Ladder stages' },
  { key: 'load', title: 'Load and ground' },
  { key: 'parts', title: 'Single parts' },
];

function Thumb({ item }: { item: TrayItemKey }) {
  const w = 44;
  const h = 28;
  let body: React.ReactNode;
  switch (item) {
    case 'ac-source':
    case 'ac-source-ct':
      body = <SourceGlyph at={{ x: 22, y: 14 }} r={11} tapped={item === 'ac-source-ct'} />;
      break;
    case 'stage-half-pos':
    case 'stage-half-neg':
    case 'stage-full-pos':
    case 'stage-full-neg': {
      const neg = item.endsWith('neg');
      body = (
        <g transform="scale(0.9) translate(2 0)">
          <line x1={2} y1={5} x2={44} y2={5} stroke={INK.lead} strokeWidth={1.2} />
          <line x1={2} y1={25} x2={44} y2={25} stroke={INK.lead} strokeWidth={1.2} />
          {item.startsWith('stage-full') ? <line x1={2} y1={15} x2={44} y2={15} stroke={INK.lead} strokeWidth={1.2} strokeDasharray="2 2" /> : null}
          <path d={neg ? 'M 30 5 L 8 25 M 34 25 L 34 5' : 'M 8 25 L 30 5 M 34 5 L 34 25'} stroke={INK.live} strokeWidth={2} fill="none" />
          <path d={neg ? 'M 14 19 l 4 -1 l -1 4 z' : 'M 24 11 l -4 1 l 1 -4 z'} fill={INK.live} stroke={INK.live} />
        </g>
      );
      break;
    }
    case 'load-resistor':
    case 'resistor':
      body = <PartOnSegment shape="resistor" from={{ x: 2, y: 14 }} to={{ x: 42, y: 14 }} />;
      break;
    case 'load-current':
      body = (
        <g>
          <circle cx={22} cy={14} r={10} fill="none" stroke={INK.live} strokeWidth={2} />
          <path d="M 15 14 L 28 14 M 24 10 L 28 14 L 24 18" fill="none" stroke={INK.live} strokeWidth={1.6} />
        </g>
      );
      break;
    case 'ground':
      body = <GroundGlyph at={{ x: 22, y: 2 }} />;
      break;
    case 'capacitor':
      body = <PartOnSegment shape="capacitor" from={{ x: 2, y: 14 }} to={{ x: 42, y: 14 }} />;
      break;
    case 'diode':
      body = <PartOnSegment shape="diode" from={{ x: 2, y: 14 }} to={{ x: 42, y: 14 }} />;
      break;
  }
  return (
    <svg width={w} height={h} viewBox={`0 0 ${w} ${h}`} aria-hidden="true" className="shrink-0">
      {body}
    </svg>
  );
}

/** The tray; `onAdd` places an item at the view centre (keyboard and click). */
export function BlockTray({ onAdd }: { onAdd: (item: TrayItemKey) => void }) {
  return (
    <nav aria-label="Blocks tray" className="space-y-3" data-testid="tray">
      <p className="text-xs text-ink-400">Drag onto the canvas, or press to place at the middle of the view.</p>
      {GROUPS.map((g) => (
        <section key={g.key} aria-label={g.title}>
          <h3 className="mb-1 text-xs font-semibold uppercase tracking-wide text-ink-400">{g.title}</h3>
          <ul className="space-y-1">
            {TRAY_ITEMS.filter((i) => i.group === g.key).map((i) => (
              <li key={i.key}>
                <button
                  type="button"
                  draggable
                  data-testid={`tray-${i.key}`}
                  title={i.hint}
                  aria-description={i.hint}
                  onDragStart={(e) => {
                    e.dataTransfer.setData(TRAY_MIME, i.key);
                    e.dataTransfer.effectAllowed = 'copy';
                  }}
                  onClick={() => onAdd(i.key)}
                  className="flex w-full cursor-grab items-center gap-2 rounded-md border border-ink-800 bg-ink-900/60 px-2 py-1 text-left text-sm text-ink-100 hover:border-copper-600 active:cursor-grabbing"
                >
                  <Thumb item={i.key} />
                  <span className="leading-tight">{i.label}</span>
                </button>
              </li>
            ))}
          </ul>
        </section>
      ))}
    </nav>
  );
}
