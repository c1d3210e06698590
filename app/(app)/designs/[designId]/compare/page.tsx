import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { CompareLayout } from '@/components/compare/compare-view';
import { OfferActions } from '@/components/designs/offer-actions';
import { AppError } from '@/lib/errors';
import { requireUser } from '../../../require-user';
import { loadComparison, type CompareQuery } from './load';

export const metadata: Metadata = { title: 'Compare' };

type SearchParams = Record<string, string | string[] | undefined>;

function first(v: string | string[] | undefined): string | undefined {
  return Array.isArray(v) ? v[0] : v;
}

/**
 * Two revisions of a design (or a design and another one, e.g. its fork, with `bDesign`) side by
 * side: `/designs/<id>/compare?a=<rev>&b=<rev>[&bDesign=<id>][&offer=<offerId>]`. Signed-in users
 * only; a design the caller may not read, or a revision that does not exist, is the app's not found.
 */
export default async function ComparePage({ params, searchParams }: { params: Promise<{ designId: string }>; searchParams: Promise<SearchParams> }) {
  const { designId } = await params;
  const sp = await searchParams;
  const query: CompareQuery = { a: first(sp.a), b: first(sp.b), bDesign: first(sp.bDesign), offer: first(sp.offer) };
  const back = new URLSearchParams(Object.entries(query).filter((e): e is [string, string] => typeof e[1] === 'string'));
  const user = await requireUser(`/designs/${designId}/compare${back.size > 0 ? `?${back.toString()}` : ''}`);
  let view;
  try {
    view = await loadComparison(user.id, designId, query);
  } catch (e) {
    if (e instanceof AppError && e.code === 'not_found') notFound();
    throw e;
  }
  const offerActions = query.offer ? <OfferActions offerId={query.offer} parentDesignId={view.a.designId} parentLatestRevision={view.a.revision} /> : undefined;
  return <CompareLayout view={view} offerId={query.offer ?? null} offerActions={offerActions} />;
}
