import { route } from '@/lib/api/handler';
import { acceptInvitation } from '@/lib/data/invitations';

export const POST = route<{ token: string }>({}, async ({ user, params }) => acceptInvitation(user.id, params.token));
