/**
 * The controller's leading-edge mode (what the editor uses): the first edit of a burst is posted
 * at once, later edits inside the window are coalesced, and a busy solve worker is replaced only
 * when the window closes.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { halfWaveStarter } from '@/lib/circuit';
import { EngineController, type EngineWorker } from '@/lib/editor/engine/controller';
import type { EngineReply, EngineRequest } from '@/lib/editor/engine/protocol';

class FakeWorker implements EngineWorker {
  sent: EngineRequest[] = [];
  terminated = false;
  onmessage: ((event: { data: EngineReply }) => void) | null = null;
  onerror: ((event: { message?: string }) => void) | null = null;
  constructor(readonly role: 'compile' | 'solve') {}
  postMessage(message: EngineRequest): void {
    this.sent.push(message);
  }
  terminate(): void {
    this.terminated = true;
  }
}

const O = { amplitudeV: 1000, frequencyHz: 1e3, capacitanceF: 1e-6, loadCurrentA: 1e-4 };
const jobs = (w: FakeWorker) => w.sent.filter((m) => m.type !== 'prime');

describe('engine controller, leading edge', () => {
  let workers: FakeWorker[] = [];
  let controller: EngineController;
  beforeEach(() => {
    vi.useFakeTimers();
    workers = [];
    controller = new EngineController(
      (role) => {
        const w = new FakeWorker(role);
        workers.push(w);
        return w;
      },
      { debounceMs: 12, immediate: true },
    );
  });
  afterEach(() => {
    controller.dispose();
    vi.useRealTimers();
  });

  it('posts the first edit to both workers at once, without waiting for the window', () => {
    const doc = halfWaveStarter(2, O);
    controller.update(doc, 1);
    const [compile, solve] = workers;
    expect(jobs(compile)).toEqual([expect.objectContaining({ type: 'compile', document: doc })]);
    expect(jobs(solve)).toEqual([expect.objectContaining({ type: 'solve', document: doc })]);
    // The window closing sends nothing again.
    vi.advanceTimersByTime(12);
    expect(jobs(compile)).toHaveLength(1);
    expect(jobs(solve)).toHaveLength(1);
  });

  it('coalesces the rest of a burst and replaces the busy solve worker once, when the window closes', () => {
    const docs = [2, 3, 4].map((n) => halfWaveStarter(n, O));
    docs.forEach((d, i) => controller.update(d, i + 1));
    const [compile, first] = workers;
    expect(jobs(first)).toHaveLength(1);
    expect(first.terminated).toBe(false);
    vi.advanceTimersByTime(12);
    expect(first.terminated).toBe(true);
    const live = workers.filter((w) => w.role === 'solve' && !w.terminated);
    expect(live).toHaveLength(1);
    expect(jobs(live[0])).toEqual([expect.objectContaining({ type: 'solve', document: docs[2] })]);
    // The compile worker is still busy with the first edit: the latest waits for its answer.
    expect(jobs(compile)).toHaveLength(1);
  });
});
