/**
 * Ladder-level editing operations on the canvas document: the starters behind "start from", growing
 * a ladder by n stages in one action, and snapping a dropped stage onto the ladder (or drive) it
 * was dropped against. Ladders are found on the document itself, from the nets its wires make
 * (`documentNets`, the compiler's grouping): stage B follows stage A when B's inputs are on A's
 * outputs' nodes (xIn on xOut, yIn on yOut, and x2In on x2Out when both are full-wave), the
 * Cockcroft–Walton column convention of the schema header. All operations return new documents;
 * the input is never changed.
 */
import { STAGE_WIDTH, portPosition } from './geometry';
import { checkWire, documentNets, type DocumentNets, type WireCandidate } from './connect';
import { MAX_BLOCKS, MAX_EDGES, type DesignBlock, type DesignDocument, type Wire } from './schema';
import { fullWaveStarter, halfWaveStarter, symmetricStarter, type StarterOptions } from './starters';
import { nextBlockId, nextWireId, TRAY_CAPACITOR, TRAY_DIODE, TRAY_DRIVE, TRAY_LOAD } from './tray';

/** Distance (px) within which a dropped stage's inputs snap onto the outputs they are dropped against. */
export const SNAP_PX = 24;

/** Most stages one "n more stages" action adds. */
export const MAX_APPEND_STAGES = 100;

type StageBlock = Extract<DesignBlock, { kind: 'stage' }>;

/** Options the starters are built with: the tray's demo parts, 1 kV peak at 20 kHz, a 100 MΩ load. */
export const STARTER_DEMO_OPTIONS: StarterOptions = {
  amplitudeV: TRAY_DRIVE.amplitudeV,
  amplitudeMode: 'peak',
  frequencyHz: TRAY_DRIVE.frequencyHz,
  capacitanceF: TRAY_CAPACITOR.capacitanceF,
  capacitorRatedV: TRAY_CAPACITOR.ratedVoltageV,
  diode: TRAY_DIODE,
  loadResistanceOhm: TRAY_LOAD.resistanceOhm,
};

/**
 * A complete starter document of `n` stages (1…200) with demo values ({@link STARTER_DEMO_OPTIONS}):
 * half-wave and full-wave ladders with positive output, or the symmetric (bipolar) pair.
 */
export function starterDocument(kind: 'half-wave' | 'full-wave' | 'symmetric', n: number): DesignDocument {
  if (kind === 'half-wave') return halfWaveStarter(n, STARTER_DEMO_OPTIONS);
  if (kind === 'full-wave') return fullWaveStarter(n, STARTER_DEMO_OPTIONS);
  return symmetricStarter(n, STARTER_DEMO_OPTIONS);
}

/** A chain of stage blocks found on the canvas, bottom (stage 1) first. */
export interface CanvasLadder {
  stages: string[];
  /** The stage whose outputs feed no further stage. */
  top: string;
  polarity: 'positive' | 'negative';
}

const COLUMNS = [
  ['xIn', 'xOut'],
  ['yIn', 'yOut'],
  ['x2In', 'x2Out'],
] as const;

/** Whether stage `b` follows stage `a`: all of b's inputs sit on the nodes of a's matching outputs. */
function follows(nets: DocumentNets, a: StageBlock, b: StageBlock): boolean {
  if (a === b) return false;
  const pairs = a.data.variant === 'full' && b.data.variant === 'full' ? COLUMNS : COLUMNS.slice(0, 2);
  return pairs.every(([i, o]) => {
    const n = nets.netOf(b.id, i);
    return n !== undefined && n === nets.netOf(a.id, o) && !nets.isGround(n);
  });
}

/** The ladders drawn on the canvas: maximal chains of stages joined output to input. */
export function canvasLadders(doc: DesignDocument): CanvasLadder[] {
  const nets = documentNets(doc);
  const stages = doc.blocks.filter((b): b is StageBlock => b.kind === 'stage');
  const next = new Map<string, StageBlock>();
  const prev = new Map<string, StageBlock>();
  for (const a of stages) {
    for (const b of stages) {
      if (prev.has(b.id) || next.has(a.id) || !follows(nets, a, b)) continue;
      next.set(a.id, b);
      prev.set(b.id, a);
    }
  }
  const out: CanvasLadder[] = [];
  const seen = new Set<string>();
  for (const s of stages) {
    if (prev.has(s.id) || seen.has(s.id)) continue;
    const chain: string[] = [];
    for (let c: StageBlock | undefined = s; c && !seen.has(c.id); c = next.get(c.id)) {
      seen.add(c.id);
      chain.push(c.id);
    }
    out.push({ stages: chain, top: chain[chain.length - 1], polarity: s.data.polarity });
  }
  // A ring of stages has no bottom; each is reported as its own chain so nothing is lost.
  for (const s of stages) if (!seen.has(s.id)) out.push({ stages: [s.id], top: s.id, polarity: s.data.polarity });
  return out;
}

const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

/** Id prefix and number of a stage id such as `s4` or `p12` (the numberless id gets `<id>_`). */
function idStem(id: string): string {
  const m = /^(.*?)(\d+)$/.exec(id);
  return m && m[1] !== '' ? m[1] : `${id}_`;
}

/** Label of the i-th new stage above `top` (numbered on from the top's label, else "Stage k"). */
function nextLabel(top: StageBlock, ladderLength: number, i: number): string {
  const m = /^(.*?)(\d+)$/.exec(top.label ?? '');
  return m ? `${m[1]}${Number(m[2]) + i}` : `Stage ${ladderLength + i}`;
}

/**
 * Add `n` stages on top of a ladder, each a copy of the top stage's values. The wires that left the
 * old top's outputs (load, output connections) move to the new top, the new stages are chained
 * output to input, and blocks to the right of the old top shift right by n stage widths so the
 * drawing stays clear. With no `ladderTopBlockId`, the canvas must hold one ladder, or a
 * symmetric pair (one positive and one negative ladder), which grows on both sides. Any stage of
 * the ladder may be given as `ladderTopBlockId`; the ladder grows from its top.
 */
export function appendStages(
  doc: DesignDocument,
  n: number,
  ladderTopBlockId?: string,
): { ok: true; document: DesignDocument; added: string[] } | { ok: false; reason: string } {
  if (!Number.isInteger(n) || n < 1 || n > MAX_APPEND_STAGES) return { ok: false, reason: `The number of stages to add must be a whole number from 1 to ${MAX_APPEND_STAGES}.` };
  const ladders = canvasLadders(doc);
  let grow: CanvasLadder[];
  if (ladderTopBlockId !== undefined) {
    const block = doc.blocks.find((b) => b.id === ladderTopBlockId);
    if (!block) return { ok: false, reason: `There is no block "${ladderTopBlockId}" on the canvas.` };
    if (block.kind !== 'stage') return { ok: false, reason: `${block.label ?? block.id} is not a stage; choose a stage of the ladder to grow.` };
    grow = ladders.filter((l) => l.stages.includes(block.id));
  } else if (ladders.length === 0) {
    return { ok: false, reason: 'There is no ladder on the canvas to grow; add a stage first.' };
  } else if (ladders.length === 1) {
    grow = ladders;
  } else if (ladders.length === 2 && ladders[0].polarity !== ladders[1].polarity) {
    grow = ladders;
  } else {
    return { ok: false, reason: `There are ${ladders.length} ladders on the canvas; select a stage of the one to grow.` };
  }
  if (doc.blocks.length + n * grow.length > MAX_BLOCKS) return { ok: false, reason: `Adding ${n * grow.length} stages would pass the limit of ${MAX_BLOCKS} blocks.` };
  if (doc.wires.length + 3 * n * grow.length > MAX_EDGES) return { ok: false, reason: `Adding ${n * grow.length} stages would pass the limit of ${MAX_EDGES} wires.` };

  const byId = new Map(doc.blocks.map((b) => [b.id, b] as const));
  const tops = grow.map((l) => byId.get(l.top) as StageBlock);
  const inGrown = new Set(grow.flatMap((l) => l.stages));
  // Blocks whose left edge lies right of a grown top's middle are "right of it" and make room.
  const threshold = Math.min(...tops.map((t) => t.position.x + STAGE_WIDTH / 2));
  const shift = n * STAGE_WIDTH;
  const work: DesignDocument = {
    ...doc,
    blocks: doc.blocks.map((b) => (!inGrown.has(b.id) && b.position.x >= threshold ? { ...b, position: { x: b.position.x + shift, y: b.position.y } } : b)),
    wires: doc.wires.map((w) => ({ ...w })),
  };
  const added: string[] = [];
  grow.forEach((ladder, li) => {
    const top = tops[li];
    const outPorts = new Set(top.data.variant === 'full' ? ['xOut', 'yOut', 'x2Out'] : ['xOut', 'yOut']);
    const stem = idStem(top.id);
    let prev: StageBlock = top;
    const fresh: StageBlock[] = [];
    for (let i = 1; i <= n; i++) {
      const id = nextBlockId(work, stem);
      const block: StageBlock = {
        id,
        kind: 'stage',
        position: { x: top.position.x + i * STAGE_WIDTH, y: top.position.y },
        label: nextLabel(top, ladder.stages.length, i),
        data: clone(top.data),
      };
      work.blocks.push(block);
      fresh.push(block);
      added.push(id);
    }
    const newTop = fresh[fresh.length - 1];
    // What left the old top now leaves the new top.
    for (const w of work.wires) {
      if (w.source === top.id && outPorts.has(w.sourcePort)) w.source = newTop.id;
      if (w.target === top.id && outPorts.has(w.targetPort)) w.target = newTop.id;
    }
    for (const block of fresh) {
      for (const [i, o] of COLUMNS) {
        if (!outPorts.has(o)) continue;
        const wire: Wire = { id: nextWireId(work), source: prev.id, sourcePort: o, target: block.id, targetPort: i };
        work.wires.push(wire);
      }
      prev = block;
    }
  });
  return { ok: true, document: work, added };
}

function distance(p: { x: number; y: number }, q: { x: number; y: number }): number {
  return Math.hypot(p.x - q.x, p.y - q.y);
}

/**
 * Snap a stage block that was just dropped at its current position. When its inputs (xIn, yIn and,
 * full-wave, x2In) each lie within {@link SNAP_PX} of the matching outputs of another stage that
 * feeds no stage yet, or its xIn lies within SNAP_PX of a drive's hot output (a first stage), the
 * result is the position that puts the ports exactly on each other and the wires that join them:
 * output to input, or for a drive hot → xIn, the second hot output → x2In of a full-wave stage, and
 * the drive's return node (its ground block when it has one) → yIn. Stages above the dropped one
 * in its own ladder are never snap targets (that would close the ladder into a ring). Only wires that
 * {@link checkWire} accepts, one after another, are returned. Null when nothing is near.
 */
export function snapWires(doc: DesignDocument, blockId: string): { position: { x: number; y: number }; wires: WireCandidate[] } | null {
  const block = doc.blocks.find((b) => b.id === blockId);
  if (!block || block.kind !== 'stage') return null;
  const xIn = portPosition(block, 'xIn') as { x: number; y: number };
  const nets = documentNets(doc);
  const stages = doc.blocks.filter((b): b is StageBlock => b.kind === 'stage');
  const fed = new Set(stages.filter((b) => b.id !== block.id).flatMap((b) => stages.filter((a) => follows(nets, a, b)).map((a) => a.id)));
  // A stage never snaps onto a stage above it in its own ladder (that would wire the ladder into a ring).
  const own = canvasLadders(doc).find((l) => l.stages.includes(block.id))?.stages ?? [];
  const above = new Set(own.slice(own.indexOf(block.id) + 1));

  let best: { score: number; position: { x: number; y: number }; wires: WireCandidate[] } | null = null;
  const consider = (score: number, anchor: { x: number; y: number }, wires: WireCandidate[]) => {
    if (best && best.score <= score) return;
    best = { score, position: { x: block.position.x + anchor.x - xIn.x, y: block.position.y + anchor.y - xIn.y }, wires };
  };

  for (const other of stages) {
    if (other.id === block.id || fed.has(other.id) || above.has(other.id)) continue;
    const pairs = block.data.variant === 'full' && other.data.variant === 'full' ? COLUMNS : COLUMNS.slice(0, 2);
    let score = 0;
    let near = true;
    for (const [i, o] of pairs) {
      const d = distance(portPosition(block, i) as { x: number; y: number }, portPosition(other, o) as { x: number; y: number });
      if (d > SNAP_PX) near = false;
      score += d;
    }
    if (!near) continue;
    consider(
      score,
      portPosition(other, 'xOut') as { x: number; y: number },
      pairs.map(([i, o]) => ({ source: other.id, sourcePort: o, target: block.id, targetPort: i })),
    );
  }

  for (const src of doc.blocks) {
    if (src.kind !== 'acSource' && src.kind !== 'dcSource') continue;
    const hotPort = src.kind === 'dcSource' ? 'pos' : 'hot';
    const hot = portPosition(src, hotPort) as { x: number; y: number };
    const d = distance(xIn, hot);
    if (d > SNAP_PX) continue;
    const wires: WireCandidate[] = [{ source: src.id, sourcePort: hotPort, target: block.id, targetPort: 'xIn' }];
    if (src.kind === 'acSource' && src.data.variant === 'centreTapped' && block.data.variant === 'full') {
      wires.push({ source: src.id, sourcePort: 'hotB', target: block.id, targetPort: 'x2In' });
    }
    const retPort = src.kind === 'dcSource' ? 'neg' : src.data.variant === 'single' ? 'ret' : 'ct';
    const retNet = nets.netOf(src.id, retPort) as string;
    const groundBlock = nets.isGround(retNet) ? doc.blocks.find((b) => b.kind === 'ground') : undefined;
    wires.push(groundBlock ? { source: groundBlock.id, sourcePort: 'g', target: block.id, targetPort: 'yIn' } : { source: src.id, sourcePort: retPort, target: block.id, targetPort: 'yIn' });
    consider(d, hot, wires);
  }

  const found = best as { score: number; position: { x: number; y: number }; wires: WireCandidate[] } | null;
  if (!found) return null;
  const accepted: WireCandidate[] = [];
  let scratch = doc;
  for (const w of found.wires) {
    if (!checkWire(scratch, w).ok) continue;
    accepted.push(w);
    scratch = { ...scratch, wires: [...scratch.wires, { id: nextWireId(scratch), ...w }] };
  }
  return { position: found.position, wires: accepted };
}
