import { describe, expect, it } from 'vitest';
import type { Diagnostic } from '@/lib/circuit/compile/diagnostics';
import { portPosition } from '@/lib/circuit/document/geometry';
import { starterDocument } from '@/lib/circuit/document/ladder-ops';
import type { EngineSnapshot, NodeReading, PartStress, SolveView } from '@/lib/editor/types';
import { applySelect, blockFaults, canvasStatus, chordMatches, dcLabelPlacements } from '@/components/editor/canvas-model';
import { SHORTCUTS } from '@/components/editor/shortcuts';

function snap(over: Partial<EngineSnapshot>): EngineSnapshot {
  return { status: 'idle', compiledVersion: null, solvedVersion: null, currentVersion: 0, compile: null, estimate: null, solve: null, warmupPending: false, timings: {}, ...over };
}

describe('canvasStatus', () => {
  it('says solved only when the shown solve belongs to the edit on the canvas', () => {
    expect(canvasStatus(snap({ status: 'solved', solvedVersion: 4, currentVersion: 4 })).status).toBe('solved');
    expect(canvasStatus(snap({ status: 'solved', solvedVersion: 3, currentVersion: 4 })).status).toBe('out-of-date');
    expect(canvasStatus(snap({ status: 'compiling', solvedVersion: 3, currentVersion: 4 })).status).toBe('out-of-date');
    expect(canvasStatus(snap({ status: 'solving', compiledVersion: 4, currentVersion: 4 })).status).toBe('solving');
    expect(canvasStatus(snap({ status: 'idle' })).status).toBe('idle');
  });
  it('has nothing to solve on an empty canvas, whatever the engine last said', () => {
    expect(canvasStatus(snap({ status: 'compiling', currentVersion: 0 }), { empty: true }).status).toBe('idle');
    expect(canvasStatus(snap({ status: 'cannot-solve', reason: 'no ground' }), { empty: true }).status).toBe('idle');
  });
  it('gives the reason when it cannot solve', () => {
    const s = canvasStatus(snap({ status: 'cannot-solve', reason: 'no ground' }));
    expect(s.status).toBe('cannot-solve');
    expect(s.text).toBe('Cannot solve: no ground');
  });
});

describe('applySelect', () => {
  it('drops and adds without repeats, keeping the order', () => {
    expect(applySelect(['a', 'b', 'c'], ['d', 'a'], ['b'])).toEqual(['a', 'c', 'd']);
    expect(applySelect([], [], ['x'])).toEqual([]);
  });
});

describe('blockFaults', () => {
  const d = (blockId: string, severity: Diagnostic['severity']): Diagnostic => ({ code: 'reversed-diode', severity, message: 'm', blockId });
  it('keeps the worst diagnostic per block and ignores notes', () => {
    const { faults } = blockFaults([d('s1', 'warning'), d('s1', 'error'), d('s2', 'warning'), d('s3', 'info'), { code: 'no-ground', severity: 'error', message: 'x' }], []);
    expect(faults.get('s1')).toBe('error');
    expect(faults.get('s2')).toBe('warning');
    expect(faults.has('s3')).toBe(false);
    expect(faults.size).toBe(2);
  });
  it('collects the roles of parts over their derated limit', () => {
    const part = (blockId: string, role: string, status: PartStress['status']): PartStress => ({ blockId, role, element: role, kind: 'C', label: role, checks: [], worstMargin: null, status });
    const { over } = blockFaults([], [part('s1', 'pumpC', 'over'), part('s1', 'diodeA', 'tight'), part('s1', 'diodeB', 'over'), part('s2', 'smoothC', 'ok')]);
    expect(over.get('s1')).toEqual(['pumpC', 'diodeB']);
    expect(over.has('s2')).toBe(false);
  });
});

describe('dcLabelPlacements', () => {
  it('puts one label per net at the first of its ports that is on the canvas', () => {
    const doc = starterDocument('half-wave', 2);
    const reading = (node: string, ports: NodeReading['ports'], meanV: number): NodeReading => ({ node, label: node, ports, meanV, rippleV: 0, minV: meanV, maxV: meanV });
    const solve = {
      nodes: {
        y_s2: reading('y_s2', ['ghost:a', 's2:yOut', 'load:a'], 1990),
        x_s1: reading('x_s1', ['s1:xOut', 's2:xIn'], 1000),
        lost: reading('lost', ['ghost:b'], 5),
      },
    } as unknown as SolveView;
    const labels = dcLabelPlacements(solve, doc);
    expect(labels).toHaveLength(2);
    const s2 = doc.blocks.find((b) => b.id === 's2')!;
    expect(labels[0]).toEqual({ node: 'y_s2', ...portPosition(s2, 'yOut')!, meanV: 1990 });
    expect(labels[1].node).toBe('x_s1');
    expect(dcLabelPlacements(null, doc)).toEqual([]);
  });
});

describe('chordMatches and the shortcut table', () => {
  const key = (k: string, mods: Partial<{ ctrlKey: boolean; metaKey: boolean; shiftKey: boolean }> = {}) => ({ key: k, ctrlKey: false, metaKey: false, shiftKey: false, ...mods });
  it('matches Ctrl (or ⌘) chords with Shift compared exactly for letters', () => {
    expect(chordMatches(key('z', { ctrlKey: true }), 'Ctrl+Z')).toBe(true);
    expect(chordMatches(key('z', { metaKey: true }), 'Ctrl+Z')).toBe(true);
    expect(chordMatches(key('Z', { ctrlKey: true, shiftKey: true }), 'Ctrl+Z')).toBe(false);
    expect(chordMatches(key('Z', { ctrlKey: true, shiftKey: true }), 'Ctrl+Shift+Z')).toBe(true);
    expect(chordMatches(key('z'), 'Ctrl+Z')).toBe(false);
    expect(chordMatches(key('f'), 'F')).toBe(true);
    expect(chordMatches(key('f', { ctrlKey: true }), 'F')).toBe(false);
  });
  it('matches punctuation whatever Shift the layout needed', () => {
    expect(chordMatches(key('?', { shiftKey: true }), '?')).toBe(true);
    expect(chordMatches(key('+', { shiftKey: true }), '+')).toBe(true);
    expect(chordMatches(key('-'), '-')).toBe(true);
    expect(chordMatches(key('Delete'), 'Delete')).toBe(true);
  });
  it('gives every key press at most one action', () => {
    const presses = [key('z', { ctrlKey: true }), key('Z', { ctrlKey: true, shiftKey: true }), key('y', { ctrlKey: true }), key('Delete'), key('Backspace'), key('c', { ctrlKey: true }), key('v', { ctrlKey: true }), key('a', { ctrlKey: true }), key('Escape'), key('f'), key('+'), key('-'), key('l'), key('s', { ctrlKey: true }), key('?', { shiftKey: true })];
    const seen = new Set<string>();
    for (const e of presses) {
      const hits = SHORTCUTS.filter((s) => s.keys.some((k) => chordMatches(e, k)));
      expect(hits).toHaveLength(1);
      seen.add(hits[0].action);
    }
    expect(seen.size).toBe(SHORTCUTS.length);
  });
});
