import { activityQuerySchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { listActivity } from '@/lib/data/activity';

export const GET = route<Record<string, never>, undefined, typeof activityQuerySchema>({ query: activityQuerySchema }, async ({ user, query }) => ({
  events: await listActivity(user.id, query),
}));
