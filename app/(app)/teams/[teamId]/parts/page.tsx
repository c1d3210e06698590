import type { Metadata } from 'next';
import { PartsLibraryRoot } from '@/components/parts/parts-library-root';
import { requireUser } from '../../../require-user';

export const metadata: Metadata = { title: 'Parts library' };

export default async function TeamPartsPage({ params }: { params: Promise<{ teamId: string }> }) {
  const { teamId } = await params;
  await requireUser(`/teams/${teamId}/parts`);
  return <PartsLibraryRoot teamId={teamId} />;
}
