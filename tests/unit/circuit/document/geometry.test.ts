import { describe, expect, it } from 'vitest';
import { blockSize, portAnchors, portPosition, STAGE_WIDTH } from '@/lib/circuit/document/geometry';
import { fullWaveStarter, halfWaveStarter, symmetricStarter, type StarterOptions } from '@/lib/circuit/document/starters';
import { portsOf, type DesignBlock, type DesignDocument } from '@/lib/circuit/document/schema';
import { createBlock, TRAY_ITEMS } from '@/lib/circuit/document/tray';

const O: StarterOptions = { amplitudeV: 1000, frequencyHz: 1000, capacitanceF: 1e-6, loadCurrentA: 1e-4 };

function boxesOverlap(a: DesignBlock, b: DesignBlock): boolean {
  const sa = blockSize(a);
  const sb = blockSize(b);
  return a.position.x < b.position.x + sb.width && b.position.x < a.position.x + sa.width && a.position.y < b.position.y + sb.height && b.position.y < a.position.y + sa.height;
}

function overlaps(doc: DesignDocument): string[] {
  const out: string[] = [];
  doc.blocks.forEach((a, i) => doc.blocks.slice(i + 1).forEach((b) => boxesOverlap(a, b) && out.push(`${a.id}/${b.id}`)));
  return out;
}

describe('geometry', () => {
  it('every tray block has a size and one anchor per port, on its edge', () => {
    for (const item of TRAY_ITEMS) {
      const b = createBlock(item.key, 'b1', { x: 0, y: 0 });
      const { width, height } = blockSize(b);
      expect(width).toBeGreaterThan(0);
      expect(height).toBeGreaterThan(0);
      const anchors = portAnchors(b);
      expect(anchors.map((a) => a.port)).toEqual(portsOf(b));
      for (const a of anchors) {
        const onEdge = { left: a.x === 0, right: a.x === width, top: a.y === 0, bottom: a.y === height }[a.side];
        expect(onEdge, `${item.key}.${a.port}`).toBe(true);
        expect(a.x >= 0 && a.x <= width && a.y >= 0 && a.y <= height).toBe(true);
      }
      // No two ports of one block share a point.
      expect(new Set(anchors.map((a) => `${a.x},${a.y}`)).size).toBe(anchors.length);
    }
  });

  it('a stage is as wide as the starters place stages apart', () => {
    const doc = halfWaveStarter(3, O);
    const [s1, s2] = ['s1', 's2'].map((id) => doc.blocks.find((b) => b.id === id) as DesignBlock);
    expect(s2.position.x - s1.position.x).toBe(STAGE_WIDTH);
    expect(blockSize(s1).width).toBe(STAGE_WIDTH);
  });

  it('chained starter stages have coinciding ports (output of k on input of k+1)', () => {
    for (const doc of [halfWaveStarter(4, O), fullWaveStarter(4, O), symmetricStarter(3, O)]) {
      const byId = new Map(doc.blocks.map((b) => [b.id, b] as const));
      let checked = 0;
      for (const w of doc.wires) {
        const a = byId.get(w.source) as DesignBlock;
        const b = byId.get(w.target) as DesignBlock;
        if (a.kind === 'stage' && b.kind === 'stage') {
          expect(portPosition(a, w.sourcePort)).toEqual(portPosition(b, w.targetPort));
          checked++;
        }
      }
      expect(checked).toBeGreaterThan(0);
    }
  });

  it('the starters’ blocks do not overlap', () => {
    for (let n = 1; n <= 4; n++) {
      expect(overlaps(halfWaveStarter(n, O))).toEqual([]);
      expect(overlaps(fullWaveStarter(n, O))).toEqual([]);
      expect(overlaps(symmetricStarter(n, O))).toEqual([]);
    }
  });

  it('the half-wave starter lines the load up on the top output and the drive on stage 1', () => {
    const doc = halfWaveStarter(2, O);
    const byId = new Map(doc.blocks.map((b) => [b.id, b] as const));
    expect(portPosition(byId.get('load') as DesignBlock, 'a')).toEqual(portPosition(byId.get('s2') as DesignBlock, 'yOut'));
    expect(portPosition(byId.get('src') as DesignBlock, 'hot')?.y).toBe(portPosition(byId.get('s1') as DesignBlock, 'xIn')?.y);
  });

  it('portPosition is in canvas coordinates, null for a port the block lacks', () => {
    const s = createBlock('stage-half-pos', 's1', { x: 10, y: 20 });
    expect(portPosition(s, 'x2In')).toBeNull();
    expect(portPosition(s, 'xIn')).toEqual({ x: 10, y: 50 });
  });
});
