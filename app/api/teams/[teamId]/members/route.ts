import { route } from '@/lib/api/handler';
import { listMembers } from '@/lib/data/teams';

export const GET = route<{ teamId: string }>({}, async ({ user, params }) => ({
  members: await listMembers(user.id, params.teamId),
}));
