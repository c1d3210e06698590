import { notificationSettingsSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { getNotificationSettings, putNotificationSettings } from '@/lib/data/activity';

export const GET = route({}, async ({ user }) => ({ settings: await getNotificationSettings(user.id) }));

export const PUT = route<Record<string, never>, typeof notificationSettingsSchema>({ body: notificationSettingsSchema }, async ({ user, body }) => ({
  settings: await putNotificationSettings(user.id, body),
}));
