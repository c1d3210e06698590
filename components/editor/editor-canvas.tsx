'use client';
/**
 * The drawing: an xyflow canvas over the editor store. Blocks become custom nodes, wires become
 * step edges; every change the user makes goes back through a store action (moves as one drag
 * gesture, wires through the connection rules, selection), so the store stays the one source of
 * truth and xyflow only renders it. Tray items can be dropped here (HTML5 drag); the pointer
 * over a port, a wire or a block body feeds the hover card.
 */
import { useCallback, useMemo, useRef, useState, type DragEvent } from 'react';
import {
  Background,
  BackgroundVariant,
  ConnectionMode,
  Controls,
  MiniMap,
  ReactFlow,
  ViewportPortal,
  useReactFlow,
  type Connection,
  type Edge,
  type EdgeChange,
  type NodeChange,
} from '@xyflow/react';
import type { DesignBlock, DesignDocument } from '@/lib/circuit/document/schema';
import { blockSize } from '@/lib/circuit/document/geometry';
import type { TrayItemKey } from '@/lib/circuit/document/tray';
import { formatSi } from '@/lib/client/format';
import type { EngineSnapshot, PortKey } from '@/lib/editor/types';
import { CommentPickHint, CommentPins, useCommentPick } from '@/components/comments/canvas-pins';
import { BLOCK_NODE_TYPES, type BlockNode } from './block-nodes';
import { applySelect, blockFaults, dcLabelPlacements, type Fault } from './canvas-model';
import { useHoverApi } from './hover-store';
import { useEditor, useEditorApi } from './store-context';

/** The drag-and-drop payload type of a tray item. */
export const TRAY_MIME = 'application/x-kilorung-tray';

/** Worst diagnostic per block, and the roles of each block's parts past their derated limit. */
function useFaults(snapshot: EngineSnapshot) {
  return useMemo(() => blockFaults(snapshot.compile?.diagnostics ?? [], snapshot.solve?.parts ?? []), [snapshot.compile, snapshot.solve]);
}

const NO_ROLES: string[] = [];

/**
 * Last node built for each block object. Documents are immutable and an edit replaces only the
 * blocks it touches, so a block object that is still in the document keeps its node object and
 * xyflow skips it (a drag re-renders one node, not the ladder).
 */
const NODE_CACHE = new WeakMap<DesignBlock, { sig: string; node: BlockNode }>();

function blockNode(block: DesignBlock, selected: boolean, fault: Fault | null, roles: string[], readOnly: boolean): BlockNode {
  const sig = `${selected}|${fault}|${roles.join()}|${readOnly}`;
  const hit = NODE_CACHE.get(block);
  if (hit && hit.sig === sig) return hit.node;
  const size = blockSize(block);
  const node: BlockNode = {
    id: block.id,
    type: block.kind,
    position: block.position,
    data: { block, fault, overRoles: roles },
    width: size.width,
    height: size.height,
    // Our sizes are known exactly, so xyflow need not wait for a measurement to draw wires.
    measured: { width: size.width, height: size.height },
    selected,
    draggable: !readOnly,
    ariaLabel: `${block.label ?? block.id} (${block.kind})`,
  };
  NODE_CACHE.set(block, { sig, node });
  return node;
}

/** Nodes for the blocks, reusing the node object of every block that did not change. */
function useNodes(document: DesignDocument, selectedBlocks: string[], faults: Map<string, Fault>, over: Map<string, string[]>, readOnly: boolean): BlockNode[] {
  return useMemo(() => {
    const selected = new Set(selectedBlocks);
    return document.blocks.map((block) => blockNode(block, selected.has(block.id), faults.get(block.id) ?? null, over.get(block.id) ?? NO_ROLES, readOnly));
  }, [document.blocks, selectedBlocks, faults, over, readOnly]);
}

// Wire colours as inline styles (not only CSS classes): the PNG/SVG export copies an SVG path's
// own attributes, not the stylesheet, so a class-only stroke would leave the wires out.
const WIRE = { stroke: '#c9d1d7', strokeWidth: 1.8 };
const WIRE_SELECTED = { stroke: '#2fa69b', strokeWidth: 2.6 };

function useEdges(document: DesignDocument, selectedWires: string[]): Edge[] {
  return useMemo(() => {
    const selected = new Set(selectedWires);
    return document.wires.map((w) => ({
      id: w.id,
      source: w.source,
      sourceHandle: w.sourcePort,
      target: w.target,
      targetHandle: w.targetPort,
      type: 'step',
      selected: selected.has(w.id),
      style: selected.has(w.id) ? WIRE_SELECTED : WIRE,
      ariaLabel: `wire ${w.source} ${w.sourcePort} to ${w.target} ${w.targetPort}`,
    }));
  }, [document.wires, selectedWires]);
}

/** The DC level written at one port of every net (toggle in the toolbar). */
function DcLabels({ snapshot, document }: { snapshot: EngineSnapshot; document: DesignDocument }) {
  const labels = useMemo(() => dcLabelPlacements(snapshot.solve, document), [snapshot.solve, document]);
  const stale = snapshot.solvedVersion !== snapshot.currentVersion;
  return (
    <ViewportPortal>
      {labels.map((l) => (
        <div
          key={l.node}
          data-testid="dc-label"
          data-node={l.node}
          data-mean-v={l.meanV}
          className={`pointer-events-none absolute rounded border px-1 text-[10px] leading-4 tabular-nums ${stale ? 'border-ink-600 bg-ink-900/90 text-ink-400' : 'border-lagoon-600 bg-ink-900/90 text-lagoon-100'}`}
          style={{ transform: `translate(${l.x + 6}px, ${l.y - 20}px)` }}
        >
          {formatSi(l.meanV, 'V')}
        </div>
      ))}
    </ViewportPortal>
  );
}

export interface EditorCanvasProps {
  snapshot: EngineSnapshot;
  showDcLabels: boolean;
  /** The design shown: its comment pins and "pin a comment" pick mode, when its comments list is on the page. */
  designId?: string;
}

/** The canvas; must sit inside a `<ReactFlowProvider>` and the editor's store and hover contexts. */
export function EditorCanvas({ snapshot, showDcLabels, designId }: EditorCanvasProps) {
  const api = useEditorApi();
  const hover = useHoverApi();
  const document = useEditor((s) => s.document);
  const selection = useEditor((s) => s.selection);
  const readOnly = useEditor((s) => s.readOnly);
  const { screenToFlowPosition } = useReactFlow();
  const { faults, over } = useFaults(snapshot);
  const nodes = useNodes(document, selection.blocks, faults, over, readOnly);
  const edges = useEdges(document, selection.wires);
  // Fit the view once, to a drawing that is already there when the editor opens: on an empty
  // canvas xyflow would otherwise zoom in to 3× on the first block dropped.
  const [fitOnOpen] = useState(() => document.blocks.length > 0);
  const box = useRef<HTMLDivElement>(null);
  const picking = useCommentPick(box, designId, snapshot, document);

  const onNodesChange = useCallback(
    (changes: NodeChange<BlockNode>[]) => {
      const positions: Record<string, { x: number; y: number }> = {};
      let moved = false;
      const add: string[] = [];
      const drop: string[] = [];
      for (const c of changes) {
        if (c.type === 'position' && c.position) {
          positions[c.id] = c.position;
          moved = true;
        } else if (c.type === 'select') (c.selected ? add : drop).push(c.id);
      }
      const s = api.getState();
      if (moved) s.moveBlocks(positions);
      if (add.length || drop.length) s.select({ blocks: applySelect(s.selection.blocks, add, drop) });
    },
    [api],
  );

  const onEdgesChange = useCallback(
    (changes: EdgeChange[]) => {
      const add: string[] = [];
      const drop: string[] = [];
      for (const c of changes) if (c.type === 'select') (c.selected ? add : drop).push(c.id);
      const s = api.getState();
      if (add.length || drop.length) s.select({ wires: applySelect(s.selection.wires, add, drop) });
    },
    [api],
  );

  const onConnect = useCallback(
    (c: Connection) => {
      if (!c.sourceHandle || !c.targetHandle) return;
      api.getState().connect({ source: c.source, sourcePort: c.sourceHandle, target: c.target, targetPort: c.targetHandle });
    },
    [api],
  );

  const onDragOver = useCallback(
    (e: DragEvent) => {
      if (readOnly || !e.dataTransfer.types.includes(TRAY_MIME)) return;
      e.preventDefault();
      e.dataTransfer.dropEffect = 'copy';
    },
    [readOnly],
  );

  const onDrop = useCallback(
    (e: DragEvent) => {
      const key = e.dataTransfer.getData(TRAY_MIME) as TrayItemKey;
      if (!key) return;
      e.preventDefault();
      const at = screenToFlowPosition({ x: e.clientX, y: e.clientY });
      api.getState().addBlock(key, at, 'center');
    },
    [api, screenToFlowPosition],
  );

  return (
    <div
      ref={box}
      className={`kr-canvas relative h-full w-full ${readOnly ? 'kr-readonly' : ''} ${picking ? 'cursor-crosshair [&_.react-flow__edge]:cursor-crosshair [&_.react-flow__handle]:cursor-crosshair [&_.react-flow__node]:cursor-crosshair' : ''}`}
      data-picking={picking ? 'true' : undefined}
      onDragOver={onDragOver}
      onDrop={onDrop}
      onPointerMove={(e) => hover.getState().move(e.clientX, e.clientY)}
      onPointerLeave={() => {
        hover.getState().setPort(null);
        hover.getState().setBlock(null);
      }}
      data-testid="editor-canvas"
    >
      <ReactFlow<BlockNode, Edge>
        nodes={nodes}
        edges={edges}
        nodeTypes={BLOCK_NODE_TYPES}
        onNodesChange={onNodesChange}
        onEdgesChange={onEdgesChange}
        onConnect={onConnect}
        onNodeDragStart={() => api.getState().beginGesture()}
        onNodeDragStop={(_e, _node, dragged) => api.getState().endGesture(dragged.map((n) => n.id))}
        onSelectionDragStart={() => api.getState().beginGesture()}
        onSelectionDragStop={(_e, dragged) => api.getState().endGesture(dragged.map((n) => n.id))}
        onEdgeMouseEnter={(e, edge) => hover.getState().setPort(`${edge.source}:${edge.sourceHandle}` as PortKey, { x: e.clientX, y: e.clientY })}
        onEdgeMouseLeave={() => hover.getState().setPort(null)}
        connectionMode={ConnectionMode.Loose}
        nodesConnectable={!readOnly}
        nodesDraggable={!readOnly}
        elementsSelectable
        deleteKeyCode={null}
        selectionKeyCode="Shift"
        multiSelectionKeyCode={['Control', 'Meta']}
        minZoom={0.1}
        maxZoom={3}
        fitView={fitOnOpen}
        fitViewOptions={{ padding: 0.15 }}
        attributionPosition="top-right"
        colorMode="dark"
        aria-label="Design canvas"
      >
        <Background variant={BackgroundVariant.Cross} gap={40} size={6} color="#232c33" />
        <Controls showInteractive={false} position="bottom-left" />
        <MiniMap pannable zoomable position="bottom-right" nodeColor="#46545f" maskColor="rgb(20 26 31 / 0.7)" />
        {showDcLabels ? <DcLabels snapshot={snapshot} document={document} /> : null}
        <CommentPins designId={designId} snapshot={snapshot} document={document} />
      </ReactFlow>
      <CommentPickHint designId={designId} />
    </div>
  );
}
