import { route } from '@/lib/api/handler';
import { getTeam } from '@/lib/data/teams';

export const GET = route<{ teamId: string }>({}, async ({ user, params }) => ({
  team: await getTeam(user.id, params.teamId),
}));
