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

/**
 * Live engine results for the document on the canvas. `version` must change whenever the
 * document does (the edit counter); the time the hook first renders a version is the start of
 * the `editToEstimateMs` / `editToSolveMs` timings.
 */
export function useEngine(document: DesignDocument, version: number): EngineSnapshot {
  const [controller] = useState(() => new EngineController(browserWorker));
  // Timing only: marks when this version was first seen (idempotent, no rendering state changes).
  controller.noteVersion(version);
  useEffect(() => () => controller.dispose(), [controller]);
  useEffect(() => {
    controller.update(document, version);
  }, [controller, document, version]);
  return useSyncExternalStore(controller.subscribe, controller.getSnapshot, controller.getSnapshot);
}
