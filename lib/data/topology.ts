/**
 * The list columns "topology" and "stages" for a document, worked out from its stage blocks:
 * all half-wave stages of one polarity → 'half-wave'; all full-wave → 'full-wave'; half-wave
 * stages of both polarities in equal numbers → 'symmetric' (stages counted per ladder); no
 * stages → null; anything else → 'custom'.
 */
import type { DesignDocument } from '../circuit/document/schema';

/** What the designs list shows about a document's circuit. */
export interface TopologySummary {
  topology: string | null;
  /** Stages per ladder (for 'symmetric', each of the two ladders). */
  stages: number | null;
}

/** Summarise `doc` for the designs list. */
export function summariseTopology(doc: DesignDocument): TopologySummary {
  const stages = doc.blocks.flatMap((b) => (b.kind === 'stage' ? [b.data] : []));
  if (stages.length === 0) return { topology: null, stages: null };
  const half = stages.filter((s) => s.variant === 'half');
  const positive = stages.filter((s) => s.polarity === 'positive').length;
  const negative = stages.length - positive;
  if (half.length === 0) return { topology: positive === 0 || negative === 0 ? 'full-wave' : 'custom', stages: stages.length };
  if (half.length !== stages.length) return { topology: 'custom', stages: stages.length };
  if (positive === 0 || negative === 0) return { topology: 'half-wave', stages: stages.length };
  if (positive === negative) return { topology: 'symmetric', stages: positive };
  return { topology: 'custom', stages: stages.length };
}
