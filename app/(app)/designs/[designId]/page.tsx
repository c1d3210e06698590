import type { Metadata } from 'next';
import { DesignRoot } from '@/components/designs/design-root';
import { requireUser } from '../../require-user';

export const metadata: Metadata = { title: 'Design' };

/** Query keys of a deep link (a mailed review, comment or offer) that sign-in must bring back. */
const DEEP_LINK_KEYS = ['revision', 'review', 'comment', 'offer'] as const;

export default async function DesignPage({
  params,
  searchParams,
}: {
  params: Promise<{ designId: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const [{ designId }, sp] = await Promise.all([params, searchParams]);
  const back = new URLSearchParams();
  for (const k of DEEP_LINK_KEYS) {
    const v = sp[k];
    const one = Array.isArray(v) ? v[0] : v;
    if (one) back.set(k, one);
  }
  await requireUser(`/designs/${designId}${back.size > 0 ? `?${back.toString()}` : ''}`);
  return <DesignRoot designId={designId} />;
}
