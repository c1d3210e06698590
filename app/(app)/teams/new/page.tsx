import type { Metadata } from 'next';
import { NewTeamForm } from '@/components/teams/new-team-form';
import { requireUser } from '../../require-user';

export const metadata: Metadata = { title: 'New team' };

export default async function NewTeamPage() {
  await requireUser('/teams/new');
  return <NewTeamForm />;
}
