import type { Metadata } from 'next';
import { TeamsRoot } from '@/components/teams/teams-root';
import { requireUser } from '../require-user';

export const metadata: Metadata = { title: 'Teams' };

export default async function TeamsPage() {
  await requireUser('/teams');
  return <TeamsRoot />;
}
