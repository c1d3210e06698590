import type { Metadata } from 'next';
import { TeamSettingsRoot } from '@/components/teams/team-settings-root';
import { requireUser } from '../../../require-user';

export const metadata: Metadata = { title: 'Team settings' };

export default async function TeamSettingsPage({ params }: { params: Promise<{ teamId: string }> }) {
  const { teamId } = await params;
  await requireUser(`/teams/${teamId}/settings`);
  return <TeamSettingsRoot teamId={teamId} />;
}
