import type { Metadata } from 'next';
import { NotificationSettingsRoot } from '@/components/settings/notification-settings-root';
import { requireUser } from '../../require-user';

export const metadata: Metadata = { title: 'Notification settings' };

export default async function NotificationSettingsPage() {
  const user = await requireUser('/settings/notifications');
  return <NotificationSettingsRoot email={user.email} />;
}
