/**
 * The list columns "topology" and "stages" for a document, copied onto the design row at each
 * save: the engine's compileDocument() recognises the ladder(s); `stages` is the stage count of
 * the longest ladder (for 'symmetric', each of the two ladders). A document that does not
 * compile shows null for both.
 */
import { compileDocument, type DesignDocument } from '../circuit';

/** What the designs list shows about a document's circuit. */
export interface TopologySummary {
  /** 'half-wave' | 'full-wave' | 'symmetric' | 'custom', or null when it did not compile. */
  topology: string | null;
  /** Stages per ladder, or null. */
  stages: number | null;
}

/** Summarise `doc` for the designs list. */
export function summariseTopology(doc: DesignDocument): TopologySummary {
  let result: ReturnType<typeof compileDocument>;
  try {
    result = compileDocument(doc);
  } catch (e) {
    // the compiler reports expected faults as values; a throw is its bug, and must not block a save
    console.error('[topology] compileDocument threw:', e instanceof Error ? e.message : e);
    return { topology: null, stages: null };
  }
  if (!result.ok) return { topology: null, stages: null };
  const ladders = result.topology.ladders;
  return { topology: result.topology.kind, stages: ladders.length ? Math.max(...ladders.map((l) => l.stages)) : null };
}
