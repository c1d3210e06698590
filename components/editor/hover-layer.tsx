'use client';
/**
 * The card at the pointer: over a port or a wire, the net's reading (DC level, ripple, min and
 * max to ground); over a block body, its parts' stress against their ratings. Everything shown
 * is already in the engine snapshot, so the card appears in the frame the pointer arrives.
 */
import { useStore } from 'zustand';
import { GROUND } from '@/lib/circuit/netlist/types';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import type { EngineSnapshot, NodeReading, PortKey } from '@/lib/editor/types';
import { NodeReadingCard } from './panel/node-reading-card';
import { PartStressCard } from './panel/part-stress-card';
import { useHoverApi } from './hover-store';
import { useEditor } from './store-context';

function Placed({ x, y, children }: { x: number; y: number; children: React.ReactNode }) {
  // Keep the card inside the window: flip to the left/top of the pointer near the far edges.
  const vw = typeof window === 'undefined' ? 1920 : window.innerWidth;
  const vh = typeof window === 'undefined' ? 1080 : window.innerHeight;
  const left = x + 260 > vw ? x - 250 : x + 16;
  const top = y + 200 > vh ? y - 190 : y + 16;
  return (
    <div className="pointer-events-none fixed z-50" style={{ left, top }}>
      {children}
    </div>
  );
}

function NoReading({ text }: { text: string }) {
  return (
    <div role="status" data-testid="node-reading-pending" className="w-56 rounded-md border border-dashed border-ink-600 bg-ink-900/95 px-3 py-2 text-xs text-ink-200">
      {text}
    </div>
  );
}

export function HoverLayer({ snapshot, document }: { snapshot: EngineSnapshot; document: DesignDocument }) {
  const hover = useHoverApi();
  const port = useStore(hover, (s) => s.port);
  const blockId = useStore(hover, (s) => s.block);
  const x = useStore(hover, (s) => s.x);
  const y = useStore(hover, (s) => s.y);
  // No card while dragging (it would trail the block), nor for a block deleted under the pointer.
  const dragging = useEditor((s) => s.gestureStart !== null);
  if (dragging) return null;
  const exists = (id: string) => document.blocks.some((b) => b.id === id);
  if (port && exists(port.slice(0, port.indexOf(':')))) return <Placed x={x} y={y}>{nodeCard(snapshot, port)}</Placed>;
  if (blockId && exists(blockId)) {
    const stresses = snapshot.solve?.parts.filter((p) => p.blockId === blockId) ?? [];
    if (stresses.length === 0) return null;
    const block = document.blocks.find((b) => b.id === blockId);
    return (
      <Placed x={x} y={y}>
        <PartStressCard stresses={stresses} title={block?.label ?? blockId} />
      </Placed>
    );
  }
  return null;
}

function nodeCard(snapshot: EngineSnapshot, port: PortKey) {
  const node = snapshot.compile?.nodeOfPort[port];
  if (!node) return <NoReading text={snapshot.compile ? 'This port is not wired to anything yet.' : 'Compiling…'} />;
  // Ground is the reference every reading is taken against: 0 V by definition, so it has no entry of its own.
  const reading = snapshot.solve?.nodes[node] ?? (snapshot.solve && node === GROUND ? groundReading(snapshot.compile?.nodeLabels[node]) : undefined);
  const label = snapshot.compile?.nodeLabels[node] ?? node;
  if (!reading) return <NoReading text={`${label}: ${snapshot.status === 'cannot-solve' ? `cannot solve (${snapshot.reason ?? 'see diagnostics'})` : 'solving…'}`} />;
  return <NodeReadingCard reading={reading} status={snapshot.status} stale={snapshot.solvedVersion !== snapshot.currentVersion} />;
}

function groundReading(label: string | undefined): NodeReading {
  return { node: GROUND, label: label ?? 'Ground', ports: [], meanV: 0, rippleV: 0, minV: 0, maxV: 0 };
}
