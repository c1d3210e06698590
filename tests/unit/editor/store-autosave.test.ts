import { describe, expect, it } from 'vitest';
import { starterDocument } from '@/lib/circuit/document/ladder-ops';
import { clearWorkingCopy, readWorkingCopy, workingCopyKey, writeWorkingCopy, type KeyValueStore } from '@/lib/editor/autosave';

function memoryStore(): KeyValueStore & { data: Map<string, string> } {
  const data = new Map<string, string>();
  return {
    data,
    getItem: (k) => data.get(k) ?? null,
    setItem: (k, v) => void data.set(k, v),
    removeItem: (k) => void data.delete(k),
  };
}

describe('working-copy autosave', () => {
  it('round-trips a working copy per design', () => {
    const st = memoryStore();
    const doc = starterDocument('full-wave', 2);
    expect(writeWorkingCopy(st, 'd1', { baseRevision: 3, savedAt: '2026-12-02T05:00:00.000Z', document: doc })).toBe(true);
    expect(readWorkingCopy(st, 'd1')).toEqual({ baseRevision: 3, savedAt: '2026-12-02T05:00:00.000Z', document: doc });
    expect(readWorkingCopy(st, 'd2')).toBeNull();
    clearWorkingCopy(st, 'd1');
    expect(readWorkingCopy(st, 'd1')).toBeNull();
  });

  it('drops stored text that is not JSON or not a valid document', () => {
    const st = memoryStore();
    st.setItem(workingCopyKey('d1'), '{not json');
    expect(readWorkingCopy(st, 'd1')).toBeNull();
    st.setItem(workingCopyKey('d1'), JSON.stringify({ baseRevision: 1, savedAt: 'x', document: { schemaVersion: 1, blocks: [{ id: 'a' }], wires: [] } }));
    expect(readWorkingCopy(st, 'd1')).toBeNull();
    st.setItem(workingCopyKey('d1'), JSON.stringify({ savedAt: 'x', document: starterDocument('half-wave', 1) }));
    expect(readWorkingCopy(st, 'd1')).toBeNull();
  });

  it('reports a storage that refuses to write', () => {
    const full: KeyValueStore = {
      getItem: () => null,
      setItem: () => {
        throw new DOMException('quota', 'QuotaExceededError');
      },
      removeItem: () => undefined,
    };
    expect(writeWorkingCopy(full, 'd1', { baseRevision: 1, savedAt: 'x', document: starterDocument('half-wave', 1) })).toBe(false);
  });
});
