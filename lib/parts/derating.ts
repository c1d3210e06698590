/**
 * Which derating a design's stress check uses. A part's stress must stay below `fraction ×
 * rating`; the design may set its own fraction (`settings.deratingFraction`) and the team may set
 * a policy (`GET /api/teams/:teamId/parts-policy`). The stricter of the two applies — the smaller
 * fraction leaves more in hand — so a design can tighten the team's rule but never loosen it.
 * With neither given, 0.8 of the rating (common practice: run parts at no more than 80 % of
 * their voltage, current and power ratings).
 *
 * Pure; runs in the browser, the server and tests.
 */

/** Fraction of a rating a part may reach when nothing else is set (common practice). */
export const DEFAULT_DERATING_FRACTION = 0.8;

/** Where the fraction in force came from. */
export type DeratingSource = 'design' | 'team' | 'default';

export interface EffectiveDerating {
  /** Share of each rating a part may reach, 0 < fraction ≤ 1. */
  fraction: number;
  /** `team` when the team policy is the stricter one (or the two agree), `design` when the design's own is stricter. */
  source: DeratingSource;
}

/** A fraction a stress check can use: finite, above zero, at most 1. */
export function isDeratingFraction(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v > 0 && v <= 1;
}

/**
 * The fraction in force and where it came from. Values that are not fractions in (0, 1] (absent,
 * NaN, 0, above 1) are ignored, as if not set.
 */
export function resolveDerating(docFraction: number | null | undefined, teamFraction: number | null | undefined): EffectiveDerating {
  const doc = isDeratingFraction(docFraction) ? docFraction : null;
  const team = isDeratingFraction(teamFraction) ? teamFraction : null;
  if (doc === null && team === null) return { fraction: DEFAULT_DERATING_FRACTION, source: 'default' };
  if (team === null) return { fraction: doc as number, source: 'design' };
  if (doc === null || team <= doc) return { fraction: team, source: 'team' };
  return { fraction: doc, source: 'design' };
}

/** The stricter (smaller) of the design's and the team's derating fractions; 0.8 when neither is set. */
export function effectiveDerating(docFraction: number | null | undefined, teamFraction: number | null | undefined): number {
  return resolveDerating(docFraction, teamFraction).fraction;
}
