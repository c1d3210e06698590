import type { Metadata } from 'next';
import { TeamDesignsRoot } from '@/components/teams/team-designs-root';
import { requireUser } from '../../require-user';

export const metadata: Metadata = { title: 'Designs' };

export default async function TeamDesignsPage({ params }: { params: Promise<{ teamId: string }> }) {
  const { teamId } = await params;
  await requireUser(`/teams/${teamId}`);
  return <TeamDesignsRoot teamId={teamId} />;
}
