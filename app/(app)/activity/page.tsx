import type { Metadata } from 'next';
import { ActivityRoot } from '@/components/activity/activity-root';
import { requireUser } from '../require-user';

export const metadata: Metadata = { title: 'Activity' };

export default async function ActivityPage() {
  await requireUser('/activity');
  return <ActivityRoot />;
}
