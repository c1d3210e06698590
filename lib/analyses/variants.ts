/**
 * The documents an analysis solves: one variant of the design per sweep point or spread sample.
 * Every function returns a new document and never changes its input.
 *
 * - Stage count: the ladder grows with `appendStages` (lib/circuit/document/ladder-ops.ts: copies
 *   of the top stage, the load and output wires moved to the new top) or shrinks by dropping its
 *   top stages, the old top's output wires moved to the new top. One ladder, or a symmetric pair
 *   (both sides change), as `appendStages` accepts.
 * - Load current: every load block becomes a constant-current load of the value.
 * - Frequency: every AC drive runs at the value.
 * - Capacitance: all stage capacitors scaled so the bottom stage's pumping capacitor has the value.
 * - Spread sample k: each capacitor drawn within its tolerance from the stream `sampleSeed(seed, k)`
 *   (see spec.ts); the load optionally too.
 */
import { appendStages, canvasLadders, type CanvasLadder } from '../circuit/document/ladder-ops';
import type { CapacitorSpec, DesignBlock, DesignDocument } from '../circuit/document/schema';
import { mulberry32, normal, sampleSeed, type Rng } from './rng';
import { sweepValue, type SpreadSpec, type SweepSpec } from './spec';

export type Variant = { ok: true; document: DesignDocument } | { ok: false; reason: string };

type StageBlock = Extract<DesignBlock, { kind: 'stage' }>;

const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

/** The ladders a stage-count change acts on: one ladder, or a symmetric pair. */
function laddersToResize(doc: DesignDocument): CanvasLadder[] | string {
  const ladders = canvasLadders(doc);
  if (ladders.length === 0) return 'the design has no ladder of stages';
  if (ladders.length === 1) return ladders;
  if (ladders.length === 2 && ladders[0].polarity !== ladders[1].polarity) return ladders;
  return `the design has ${ladders.length} ladders; a stage-count sweep needs one ladder or one symmetric pair`;
}

/** Number of stages of the design's ladder (the longer side of a pair), or the reason it has none. */
export function stageCountOf(doc: DesignDocument): number | string {
  const ladders = laddersToResize(doc);
  return typeof ladders === 'string' ? ladders : Math.max(...ladders.map((l) => l.stages.length));
}

/** Drop the top `drop` stages of `ladder`; what left the old top leaves the new top. */
function shrinkLadder(doc: DesignDocument, ladder: CanvasLadder, keep: number): DesignDocument {
  const removed = new Set(ladder.stages.slice(keep));
  const newTop = ladder.stages[keep - 1];
  const oldTop = ladder.top;
  const outPorts = new Set(['xOut', 'yOut', 'x2Out']);
  const wires = doc.wires
    .map((w) => {
      const v = { ...w };
      if (v.source === oldTop && outPorts.has(v.sourcePort) && !removed.has(v.target)) v.source = newTop;
      if (v.target === oldTop && outPorts.has(v.targetPort) && !removed.has(v.source)) v.target = newTop;
      return v;
    })
    .filter((w) => !removed.has(w.source) && !removed.has(w.target));
  return { ...doc, blocks: doc.blocks.filter((b) => !removed.has(b.id)), wires };
}

/** The design with its ladder (each side of a symmetric pair) at `n` stages. */
export function withStages(doc: DesignDocument, n: number): Variant {
  if (!Number.isInteger(n) || n < 1) return { ok: false, reason: 'the stage count must be a whole number of at least 1' };
  const ladders = laddersToResize(doc);
  if (typeof ladders === 'string') return { ok: false, reason: ladders };
  let out = clone(doc);
  for (const ladder of ladders) {
    const have = ladder.stages.length;
    if (n > have) {
      const grown = appendStages(out, n - have, ladder.top);
      if (!grown.ok) return { ok: false, reason: grown.reason };
      out = grown.document;
    } else if (n < have) {
      out = shrinkLadder(out, ladder, n);
    }
  }
  return { ok: true, document: out };
}

/** Every load block drawing a constant `currentA`. */
export function withLoadCurrent(doc: DesignDocument, currentA: number): Variant {
  if (!doc.blocks.some((b) => b.kind === 'load')) return { ok: false, reason: 'the design has no load block to set the current of' };
  return {
    ok: true,
    document: { ...clone(doc), blocks: doc.blocks.map((b) => (b.kind === 'load' ? { ...clone(b), data: { mode: 'current' as const, currentA } } : clone(b))) },
  };
}

/** Every AC drive at `frequencyHz`. */
export function withFrequency(doc: DesignDocument, frequencyHz: number): Variant {
  if (!doc.blocks.some((b) => b.kind === 'acSource')) return { ok: false, reason: 'the design has no AC drive to set the frequency of' };
  return {
    ok: true,
    document: { ...clone(doc), blocks: doc.blocks.map((b) => (b.kind === 'acSource' ? { ...clone(b), data: { ...b.data, frequencyHz } } : clone(b))) },
  };
}

/** The capacitance the capacitance sweep sets: the bottom stage's pumping capacitor (first ladder). */
export function referenceCapacitance(doc: DesignDocument): number | null {
  const ladders = canvasLadders(doc);
  const id = ladders[0]?.stages[0];
  const block = doc.blocks.find((b): b is StageBlock => b.kind === 'stage' && b.id === id);
  return block ? block.data.pumpC.capacitanceF : null;
}

const scaleCap = (c: CapacitorSpec, k: number): CapacitorSpec => ({ ...c, capacitanceF: c.capacitanceF * k });

/** Every stage capacitor scaled so the bottom stage's pumping capacitor is `capacitanceF`. */
export function withStageCapacitance(doc: DesignDocument, capacitanceF: number): Variant {
  const ref = referenceCapacitance(doc);
  if (ref === null) return { ok: false, reason: 'the design has no stage capacitors to scale' };
  const k = capacitanceF / ref;
  const blocks = doc.blocks.map((b): DesignBlock => {
    if (b.kind !== 'stage') return clone(b);
    const d = clone(b.data);
    return { ...clone(b), data: { ...d, pumpC: scaleCap(d.pumpC, k), smoothC: scaleCap(d.smoothC, k), ...(d.pump2C ? { pump2C: scaleCap(d.pump2C, k) } : {}) } };
  });
  return { ok: true, document: { ...clone(doc), blocks } };
}

/** The document of sweep point `index`. */
export function sweepVariant(doc: DesignDocument, spec: SweepSpec, index: number): Variant {
  const v = sweepValue(spec, index);
  switch (spec.parameter) {
    case 'stages':
      return withStages(doc, v);
    case 'loadCurrent':
      return withLoadCurrent(doc, v);
    case 'frequency':
      return withFrequency(doc, v);
    case 'capacitance':
      return withStageCapacitance(doc, v);
  }
}

/** A relative deviation within ±tol: uniform, or normal with 3σ = tol cut at ±tol (redrawn). */
function deviation(rng: Rng, tol: number, dist: SpreadSpec['distribution']): number {
  if (tol === 0) return 0;
  if (dist === 'uniform') return (2 * rng() - 1) * tol;
  for (;;) {
    const d = (normal(rng) * tol) / 3;
    if (Math.abs(d) <= tol) return d;
  }
}

/** The factors one spread sample applied: `blockId.part` → C_drawn / C_nominal (and `blockId.load`). */
export type SampleFactors = Record<string, number>;

/**
 * The document of spread sample `index`, and the factor each varied part was multiplied by.
 * Parts are drawn in document order (blocks, then pumpC, smoothC, pump2C), so the same seed and
 * index always give the same sample.
 */
export function spreadVariant(doc: DesignDocument, spec: SpreadSpec, index: number): { document: DesignDocument; factors: SampleFactors } {
  const rng = mulberry32(sampleSeed(spec.seed, index));
  const factors: SampleFactors = {};
  const draw = (key: string, c: CapacitorSpec): CapacitorSpec => {
    const tol = c.tolerance ?? spec.assumedTolerance;
    const k = 1 + deviation(rng, tol, spec.distribution);
    factors[key] = k;
    return scaleCap(c, k);
  };
  const blocks = doc.blocks.map((b): DesignBlock => {
    const c = clone(b);
    if (c.kind === 'stage') {
      const d = c.data;
      return { ...c, data: { ...d, pumpC: draw(`${c.id}.pumpC`, d.pumpC), smoothC: draw(`${c.id}.smoothC`, d.smoothC), ...(d.pump2C ? { pump2C: draw(`${c.id}.pump2C`, d.pump2C) } : {}) } };
    }
    if (c.kind === 'capacitor') return { ...c, data: draw(c.id, c.data) };
    if (c.kind === 'load' && spec.loadTolerance > 0) {
      const k = 1 + deviation(rng, spec.loadTolerance, spec.distribution);
      factors[`${c.id}.load`] = k;
      return { ...c, data: c.data.mode === 'resistor' ? { mode: 'resistor', resistanceOhm: c.data.resistanceOhm * k } : { mode: 'current', currentA: c.data.currentA * k } };
    }
    return c;
  });
  return { document: { ...clone(doc), blocks }, factors };
}
