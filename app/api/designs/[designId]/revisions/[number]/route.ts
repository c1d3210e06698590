import { route } from '@/lib/api/handler';
import { getRevision } from '@/lib/data/designs';

export const GET = route<{ designId: string; number: string }>({}, async ({ user, params }) => ({
  revision: await getRevision(user.id, params.designId, params.number),
}));
