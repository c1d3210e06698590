import { publicRoute } from '@/lib/api/handler';
import { previewInvitation } from '@/lib/data/invitations';

/** Anyone holding the link may see what it is for (the token is the secret). */
export const GET = publicRoute<{ token: string }>({}, async ({ params }) => ({ invitation: await previewInvitation(params.token) }));
