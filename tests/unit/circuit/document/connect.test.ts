import { describe, expect, it } from 'vitest';
import { checkWire, documentNets, type WireCandidate } from '@/lib/circuit/document/connect';
import { compileDocument } from '@/lib/circuit/compile/compile';
import { fullWaveStarter, halfWaveStarter, symmetricStarter, type StarterOptions } from '@/lib/circuit/document/starters';
import type { DesignDocument } from '@/lib/circuit/document/schema';
import { createBlock, emptyDocument } from '@/lib/circuit/document/tray';

const O: StarterOptions = { amplitudeV: 1000, frequencyHz: 1000, capacitanceF: 1e-6, loadCurrentA: 1e-4 };
const w = (source: string, sourcePort: string, target: string, targetPort: string): WireCandidate => ({ source, sourcePort, target, targetPort });

function refused(doc: DesignDocument, c: WireCandidate): string {
  const r = checkWire(doc, c);
  if (r.ok) throw new Error(`accepted ${JSON.stringify(c)}`);
  return r.reason;
}

function withWire(doc: DesignDocument, c: WireCandidate): DesignDocument {
  return { ...doc, wires: [...doc.wires, { id: `t${doc.wires.length + 1}`, ...c }] };
}

describe('documentNets groups ports as the compiler does', () => {
  it('every compiled net is one document net, and different nets stay different', () => {
    for (const doc of [halfWaveStarter(3, O), fullWaveStarter(2, O), symmetricStarter(2, O)]) {
      const r = compileDocument(doc);
      if (!r.ok) throw new Error(r.reason);
      const nets = documentNets(doc);
      const seen = new Map<string, string>();
      for (const [node, ports] of Object.entries(r.netlist.nodeOrigins ?? {})) {
        const keys = new Set(ports.filter((p) => !p.port.endsWith(':internal')).map((p) => nets.netOf(p.blockId, p.port)));
        if (keys.size === 0) continue;
        expect(keys.size, node).toBe(1);
        const k = [...keys][0] as string;
        expect(seen.has(k), `${node} and ${seen.get(k)} share a document net`).toBe(false);
        seen.set(k, node);
        expect(nets.isGround(k)).toBe(node === '0');
      }
    }
  });

  it('two ground blocks are one node even without a wire between them', () => {
    const doc = { ...emptyDocument(), blocks: [createBlock('ground', 'g1', { x: 0, y: 0 }), createBlock('ground', 'g2', { x: 100, y: 0 })] };
    const nets = documentNets(doc);
    expect(nets.netOf('g1', 'g')).toBe(nets.netOf('g2', 'g'));
    expect(refused(doc, w('g1', 'g', 'g2', 'g'))).toMatch(/already on the same node \(ground\)/);
  });
});

describe('checkWire', () => {
  const doc = halfWaveStarter(3, O);

  it('accepts a sensible wire: a resistor from the top output to ground', () => {
    const d = { ...doc, blocks: [...doc.blocks, createBlock('resistor', 'r1', { x: 0, y: 600 })] };
    expect(checkWire(d, w('s3', 'yOut', 'r1', 'a'))).toEqual({ ok: true });
    expect(checkWire(withWire(d, w('s3', 'yOut', 'r1', 'a')), w('r1', 'b', 'gnd', 'g'))).toEqual({ ok: true });
  });

  it('refuses unknown blocks and ports', () => {
    expect(refused(doc, w('nope', 'a', 's1', 'xIn'))).toMatch(/no block "nope"/);
    expect(refused(doc, w('s1', 'x2In', 's2', 'xIn'))).toBe('Stage 1 has no port "x2In".');
  });

  it('refuses a wire from a port to itself and a repeated wire (either direction)', () => {
    expect(refused(doc, w('s1', 'xIn', 's1', 'xIn'))).toMatch(/two different ports/);
    const first = doc.wires.find((x) => x.source === 's1' && x.target === 's2' && x.sourcePort === 'xOut') as WireCandidate;
    expect(refused(doc, w(first.target, first.targetPort, first.source, first.sourcePort))).toMatch(/already wired together/);
  });

  it('refuses joining two ports already on one node', () => {
    // The load's a end and stage 3's smoothing output are wired; stage 1's yIn is on ground with the load's b end.
    expect(refused(doc, w('s1', 'yIn', 'load', 'b'))).toBe('The smoothing-column input of Stage 1 and the end b of Load are already on the same node (ground).');
  });

  it('names the stage part a wire would short', () => {
    // x1 (s1.xOut) to x2 (s2.xOut): the pumping capacitor of stage 2.
    expect(refused(doc, w('s1', 'xOut', 's2', 'xOut'))).toBe('This wire would short the pumping capacitor of Stage 2.');
    expect(refused(doc, w('s2', 'yOut', 's3', 'yOut'))).toBe('This wire would short the smoothing capacitor of Stage 3.');
    expect(refused(doc, w('s1', 'yOut', 's2', 'xOut'))).toBe('This wire would short diode A of Stage 2.');
    expect(refused(doc, w('s3', 'xOut', 'load', 'a'))).toBe('This wire would short diode B of Stage 3.');
    // A stage's input to its own output.
    expect(refused(doc, w('s2', 'xIn', 's2', 'xOut'))).toBe('This wire would short the pumping capacitor of Stage 2.');
  });

  it('refuses two ports of one block even when no single part is bypassed', () => {
    expect(refused(doc, w('s2', 'xIn', 's2', 'yOut'))).toMatch(/^This wire would join two ports of Stage 2 \(its driven-column input and smoothing-column output\)/);
  });

  it('refuses shorting the drive, the load and a full-wave stage’s second column', () => {
    expect(refused(doc, w('src', 'hot', 'gnd', 'g'))).toBe('This wire would short Drive.');
    expect(refused(doc, w('s3', 'yOut', 'gnd', 'g'))).toBe('This wire would short Load.');
    const fw = fullWaveStarter(2, O);
    expect(refused(fw, w('s1', 'x2Out', 's2', 'x2Out'))).toBe('This wire would short the second pumping capacitor of Stage 2.');
    expect(refused(fw, w('src', 'hot', 'src', 'hotB'))).toBe('This wire would join the two hot outputs of Drive and short its windings.');
    expect(refused(fw, w('src', 'hotB', 'gnd', 'g'))).toBe('This wire would short the second half of Drive.');
  });

  it('refuses sources in parallel and two sources’ outputs on one node', () => {
    const second = { ...createBlock('ac-source', 'src2', { x: 0, y: 600 }), label: 'Spare drive' };
    const d = withWire({ ...doc, blocks: [...doc.blocks, second] }, w('src2', 'ret', 'gnd', 'g'));
    expect(refused(d, w('src2', 'hot', 's1', 'xIn'))).toBe('This wire would close a loop of voltage sources through Drive and Spare drive, which shorts them.');
    const floating = { ...doc, blocks: [...doc.blocks, second] };
    expect(refused(floating, w('src2', 'hot', 'src', 'hot'))).toBe('This wire would tie the outputs of Spare drive and Drive together.');
    // Stacking in series (output of one on the return of the other) is allowed.
    expect(checkWire(floating, w('src2', 'ret', 'src', 'hot'))).toEqual({ ok: true });
  });

  it('names blocks that share a label by their id too', () => {
    const base = { ...emptyDocument(), blocks: [createBlock('capacitor', 'c1', { x: 0, y: 0 }), createBlock('capacitor', 'c2', { x: 200, y: 0 })] };
    const d = withWire(base, w('c1', 'a', 'c2', 'a'));
    expect(checkWire(d, w('c1', 'b', 'c2', 'b'))).toEqual({ ok: true });
    expect(refused(d, w('c2', 'a', 'c1', 'b'))).toBe('This wire would short Capacitor (c1).');
  });

  it('every wire of the starters is accepted when drawn one by one', () => {
    for (const full of [halfWaveStarter(3, O), fullWaveStarter(3, O), symmetricStarter(3, O)]) {
      let d: DesignDocument = { ...full, wires: [] };
      for (const x of full.wires) {
        expect(checkWire(d, x), `${x.source}.${x.sourcePort} → ${x.target}.${x.targetPort}`).toEqual({ ok: true });
        d = { ...d, wires: [...d.wires, x] };
      }
    }
  });
});
