/**
 * What one engine worker does with a request (the worker script only forwards to this), on real
 * compiles and solves of small starters: the compile reply carries the compiler's view and the
 * closed-form estimate, the solve reply the steady state of the exported netlist exactly as
 * `scripts/solve.ts` solves it, and the warm-up reply the engine's own warm-up figures.
 */
import { describe, expect, it } from 'vitest';
import {
  compileDocument,
  estimateFromNetlist,
  halfWaveStarter,
  parseNetlist,
  recognizeTopology,
  solveNetlist,
  symmetricStarter,
  type DesignDocument,
} from '@/lib/circuit';
import { handleEngineRequest, primeDocument, warmupAfterSolve } from '@/lib/editor/engine/run';
import type { EngineReply } from '@/lib/editor/engine/protocol';
import { netlistTextOf } from '@/lib/editor/engine/netlist-text';

const O = { amplitudeV: 2000, frequencyHz: 1e3, capacitanceF: 1e-6, loadCurrentA: 2e-4 };

function run(message: unknown): EngineReply[] {
  const replies: EngineReply[] = [];
  handleEngineRequest(message, (r) => replies.push(r));
  return replies;
}

describe('compile request', () => {
  it('answers with the compile view and the closed-form estimate', () => {
    const doc = symmetricStarter(3, O);
    const [reply, ...rest] = run({ type: 'compile', version: 7, document: doc });
    expect(rest).toEqual([]);
    if (reply.type !== 'compiled') throw new Error(reply.type);
    expect(reply.version).toBe(7);
    expect(reply.compile.badge.label).toBe('Symmetric · 3 stages · ±');
    const c = compileDocument(doc);
    if (!c.ok) throw new Error(c.reason);
    expect(reply.estimate?.result).toEqual(estimateFromNetlist(c.netlist, c.topology));
    // Textbook no-load: a ±3-stage pair gives 4nVp = 24 kV across its outputs (REFERENCES §3).
    expect(reply.estimate?.result.idealNoLoadV).toBe(4 * 3 * 2000);
    expect(reply.timings.compileMs).toBeGreaterThanOrEqual(0);
    expect(reply.timings.estimateMs).toBeGreaterThanOrEqual(0);
  });

  it('refuses a malformed request, naming the field', () => {
    const doc = halfWaveStarter(2, O);
    const bad = { ...doc, blocks: doc.blocks.map((b) => (b.kind === 'acSource' ? { ...b, data: { ...b.data, frequencyHz: -5 } } : b)) };
    const [reply] = run({ type: 'compile', version: 3, document: bad });
    expect(reply).toMatchObject({ type: 'invalid', version: 3 });
    expect(reply.type === 'invalid' && reply.reason).toMatch(/^document\.blocks\.0\.data\.frequencyHz: /);
    expect(run({ type: 'simulate', version: 1 })[0]).toMatchObject({ type: 'invalid', version: 1 });
    expect(run(null)[0]).toMatchObject({ type: 'invalid', version: null });
  });

  it('reports a drawing that does not compile as a compile view with the reason, and no estimate', () => {
    const doc = halfWaveStarter(2, O);
    const shorted: DesignDocument = { ...doc, wires: [...doc.wires, { id: 'wx', source: 'src', sourcePort: 'hot', target: 'gnd', targetPort: 'g' }] };
    const [reply] = run({ type: 'compile', version: 1, document: shorted });
    if (reply.type !== 'compiled') throw new Error(reply.type);
    expect(reply.compile.ok).toBe(false);
    expect(reply.compile.reason).toMatch(/short/);
    expect(reply.estimate).toBeNull();
    const [solve] = run({ type: 'solve', version: 2, document: shorted });
    expect(solve).toMatchObject({ type: 'cannot-solve', version: 2 });
    expect(solve.type === 'cannot-solve' && solve.reason).toMatch(/does not compile: .*short/);
  });
});

describe('solve request (2-stage half-wave)', () => {
  const doc = halfWaveStarter(2, O);
  const replies = run({ type: 'solve', version: 4, document: doc });

  it('posts the steady state first, then the warm-up', () => {
    expect(replies.map((r) => r.type)).toEqual(['solved', 'warmup']);
    expect(replies.every((r) => r.version === 4)).toBe(true);
  });

  it('solves the exported netlist with the options of scripts/solve.ts', () => {
    const solved = replies[0];
    if (solved.type !== 'solved') throw new Error(solved.type);
    const c = compileDocument(doc);
    if (!c.ok) throw new Error(c.reason);
    const parsed = parseNetlist(netlistTextOf(c.netlist));
    if (!parsed.ok) throw new Error('parse');
    const topology = recognizeTopology(parsed.netlist);
    // scripts/solve.ts: outputNodes from the read-back topology, default budget and tolerances.
    const cli = solveNetlist(parsed.netlist, { warmup: false, outputNodes: topology.outputs.map((o) => o.node), waveformPoints: 0 });
    if (!cli.ok) throw new Error(cli.reason);
    expect(solved.solve.outputs).toEqual(cli.outputs);
    for (const [node, m] of Object.entries(cli.nodes)) {
      expect(solved.solve.nodes[node].meanV).toBe(m.mean);
      expect(solved.solve.nodes[node].rippleV).toBe(m.ripple);
    }
    // Cockcroft–Walton: no-load 2nVp = 8 kV less the load drop (REFERENCES §1.1).
    const out = solved.solve.nodes[cli.outputs[0].node].meanV;
    expect(out).toBeLessThan(8000);
    expect(out).toBeGreaterThan(0.95 * 8000);
    expect(solved.timings.solveMs).toBeGreaterThan(0);
  });

  it('reports the engine’s own warm-up (the figures solveNetlist({ warmup: true }) gives)', () => {
    const w = replies[1];
    if (w.type !== 'warmup' || !w.warmup) throw new Error(JSON.stringify(w));
    const c = compileDocument(doc);
    if (!c.ok) throw new Error(c.reason);
    const parsed = parseNetlist(netlistTextOf(c.netlist));
    if (!parsed.ok) throw new Error('parse');
    const outputs = recognizeTopology(parsed.netlist).outputs.map((o) => o.node);
    const full = solveNetlist(parsed.netlist, { warmup: true, outputNodes: outputs, waveformPoints: 0 });
    if (!full.ok || !full.warmup) throw new Error('warm-up');
    expect(w.warmup.t90S).toBe(full.warmup.t90);
    expect(w.warmup.t99S).toBe(full.warmup.t99);
    expect(w.warmup.cycles99).toBe(full.warmup.cycles99);
    expect(w.warmup.curve).toEqual(full.warmup.curve);
    // A 2-stage ladder charges within tens of cycles (REFERENCES §6 order of magnitude n²).
    expect(w.warmup.cycles90).toBeGreaterThan(1);
    expect(w.warmup.cycles90).toBeLessThan(100);
  });

  it('primes a worker with one small solve and says so', () => {
    const [reply, ...rest] = run({ type: 'prime', version: 0 });
    expect(rest).toEqual([]);
    expect(reply).toMatchObject({ type: 'primed', version: 0 });
    expect(reply.type === 'primed' && reply.timings.solveMs).toBeGreaterThan(0);
    // The priming circuit really runs the solver (it solves, it is not rejected early).
    expect(run({ type: 'solve', version: 1, document: primeDocument(), warmup: false })[0].type).toBe('solved');
  });

  it('has no warm-up for a solve without an AC drive', () => {
    const fake = { ok: true, periodS: 0, outputs: [], nodes: {} } as unknown as Parameters<typeof warmupAfterSolve>[1];
    const parsed = parseNetlist('dc\nV1 a 0 DC 5\nR1 a 0 1k\n.end\n');
    if (!parsed.ok) throw new Error('parse');
    expect(warmupAfterSolve(parsed.netlist, fake)).toEqual({ ok: false, reason: expect.stringMatching(/no AC drive/) });
  });
});
