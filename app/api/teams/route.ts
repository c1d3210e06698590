import { createTeamSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { createTeam, listTeams } from '@/lib/data/teams';

export const GET = route({}, async ({ user }) => ({ teams: await listTeams(user.id) }));

export const POST = route({ body: createTeamSchema, status: 201 }, async ({ user, body }) => ({
  team: await createTeam(user.id, body.name),
}));
