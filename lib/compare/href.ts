/** The compare page's address (no engine imports, so client components can use it). */

/**
 * The compare page's address for a pair of revisions (`designId` is side a's design; `bDesign`
 * only when side b is another design; `offer` keeps an offer being decided in the address).
 */
export function compareHref(designId: string, q: { a: number; b: number; bDesign?: string | null; offer?: string | null }): string {
  const p = new URLSearchParams({ a: String(q.a), b: String(q.b) });
  if (q.bDesign && q.bDesign !== designId) p.set('bDesign', q.bDesign);
  if (q.offer) p.set('offer', q.offer);
  return `/designs/${encodeURIComponent(designId)}/compare?${p.toString()}`;
}
