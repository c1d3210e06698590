import { changeRoleSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { changeMemberRole, removeMember } from '@/lib/data/teams';

type P = { teamId: string; userId: string };

export const PATCH = route<P, typeof changeRoleSchema>({ body: changeRoleSchema }, async ({ user, params, body }) => ({
  member: await changeMemberRole(user.id, params.teamId, params.userId, body.role),
}));

export const DELETE = route<P>({}, async ({ user, params }) => {
  await removeMember(user.id, params.teamId, params.userId);
  return { ok: true };
});
