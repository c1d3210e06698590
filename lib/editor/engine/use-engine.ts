'use client';
/**
 * `useEngine(document, version)`: the editor's live results. Every new `version` (the store's
 * edit counter) is compiled and solved in Web Workers (see `controller.ts` for the scheduling);
 * the returned {@link EngineSnapshot} changes as each result arrives: compile view and estimate
 * within a few ms, the steady-state solve, then the warm-up.
 */
import { useEffect, useState, useSyncExternalStore } from 'react';
import type { DesignDocument } from '@/lib/circuit';
import type { EngineSnapshot } from '../types';
import { EngineController, type EngineWorker } from './controller';

/** A module worker running `engine.worker.ts` (the literal `new URL(…, import.meta.url)` form lets the bundler find and bundle it). */
function browserWorker(role: 'compile' | 'solve'): EngineWorker {
  return new Worker(new URL('./engine.worker.ts', import.meta.url), { type: 'module', name: `kilorung-${role}` }) as unknown as EngineWorker;
}

/** Where the editor's document lives (the editor store has this shape). */
export interface EngineSource {
  subscribe(listener: (state: { document: DesignDocument; version: number }) => void): () => void;
}

/**
 * Live engine results for the document on the canvas. `version` must change whenever the
 * document does (the edit counter); the time the hook first renders a version is the start of
 * the `editToEstimateMs` / `editToSolveMs` timings. With `source` (the editor store), each edit is
 * handed to the workers the moment the store changes.
 */
export function useEngine(document: DesignDocument, version: number, source?: EngineSource): EngineSnapshot {
  const [controller] = useState(() => new EngineController(browserWorker, { immediate: true }));
  // Timing only: marks when this version was first seen (idempotent, no rendering state changes).
  controller.noteVersion(version);
  useEffect(() => () => controller.dispose(), [controller]);
  useEffect(() => {
    controller.update(document, version);
  }, [controller, document, version]);
  // Straight from the store, so an edit's jobs are posted before React draws the edit (the effect
  // above then finds the version already seen and does nothing).
  useEffect(() => source?.subscribe((s) => controller.update(s.document, s.version)), [controller, source]);
  return useSyncExternalStore(controller.subscribe, controller.getSnapshot, controller.getSnapshot);
}
