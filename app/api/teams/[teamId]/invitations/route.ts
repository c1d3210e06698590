import { inviteSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { createInvitation, listInvitations } from '@/lib/data/invitations';

type P = { teamId: string };

export const GET = route<P>({}, async ({ user, params }) => ({
  invitations: await listInvitations(user.id, params.teamId),
}));

export const POST = route<P, typeof inviteSchema>({ body: inviteSchema, status: 201 }, async ({ user, params, body }) => ({
  invitation: await createInvitation(user.id, params.teamId, body.email, body.role),
}));
