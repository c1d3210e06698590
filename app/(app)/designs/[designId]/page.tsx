import type { Metadata } from 'next';
import { DesignRoot } from '@/components/designs/design-root';
import { requireUser } from '../../require-user';

export const metadata: Metadata = { title: 'Design' };

export default async function DesignPage({ params }: { params: Promise<{ designId: string }> }) {
  const { designId } = await params;
  await requireUser(`/designs/${designId}`);
  return <DesignRoot designId={designId} />;
}
