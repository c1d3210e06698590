import { route } from '@/lib/api/handler';
import { revokeInvitation } from '@/lib/data/invitations';

export const DELETE = route<{ teamId: string; invitationId: string }>({}, async ({ user, params }) => {
  await revokeInvitation(user.id, params.teamId, params.invitationId);
  return { ok: true };
});
