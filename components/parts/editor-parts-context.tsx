'use client';
/**
 * What the design editor knows about its team's parts library: the design's team, every part of
 * the team (for the inspector's "use library part" picker, the bound part numbers and the
 * "library part changed" check) and the team's derating policy (for the stress check). Mounted
 * once per editor; components outside an editor get `null` and show no library controls.
 */
import { createContext, useContext, useMemo, type ReactNode } from 'react';
import { useDesign } from '@/lib/client/hooks';
import { useParts, usePartsPolicy } from '@/lib/client/parts';
import { withTeamDerating } from '@/lib/editor/engine/view-model';
import type { EngineSnapshot } from '@/lib/editor/types';
import type { PartDto } from '@/lib/parts/schema';

export interface EditorParts {
  teamId: string | null;
  /** Every part of the team; undefined while loading or when it could not be read. */
  parts: PartDto[] | undefined;
  byId: Map<string, PartDto>;
  loading: boolean;
  error: unknown;
  /** The team's derating fraction; null while unknown or when the team has set none. */
  teamFraction: number | null;
}

const EditorPartsContext = createContext<EditorParts | null>(null);

const NO_PARTS = new Map<string, PartDto>();

/** Reads the design's team, its parts and its derating policy for the editor inside. */
export function EditorPartsProvider({ designId, children }: { designId: string; children: ReactNode }) {
  const design = useDesign(designId);
  const teamId = design.data?.design.teamId ?? null;
  const parts = useParts(teamId ?? undefined, {});
  const policy = usePartsPolicy(teamId ?? undefined);
  const list = parts.data?.parts;
  const fraction = policy.data?.policy.deratingFraction;
  const value = useMemo<EditorParts>(
    () => ({
      teamId,
      parts: list,
      byId: list ? new Map(list.map((p) => [p.id, p] as const)) : NO_PARTS,
      loading: parts.isPending,
      error: parts.error,
      teamFraction: typeof fraction === 'number' ? fraction : null,
    }),
    [teamId, list, parts.isPending, parts.error, fraction],
  );
  return <EditorPartsContext.Provider value={value}>{children}</EditorPartsContext.Provider>;
}

/** The editor's library view, or null outside an {@link EditorPartsProvider}. */
export function useEditorParts(): EditorParts | null {
  return useContext(EditorPartsContext);
}

/**
 * The engine snapshot with its stress judged at the stricter of the design's derating
 * (`docFraction`) and the team's policy — what the canvas flags, the hover card and the stress
 * table read. The same snapshot object comes back while nothing changes.
 */
export function useTeamDeratedSnapshot(snapshot: EngineSnapshot, docFraction: number | undefined): EngineSnapshot {
  const team = useContext(EditorPartsContext)?.teamFraction ?? null;
  return useMemo(() => {
    if (!snapshot.solve) return snapshot;
    const solve = withTeamDerating(snapshot.solve, docFraction, team);
    return solve === snapshot.solve ? snapshot : { ...snapshot, solve };
  }, [snapshot, docFraction, team]);
}
