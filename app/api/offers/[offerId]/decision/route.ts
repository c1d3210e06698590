import { offerDecisionSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { decideOffer } from '@/lib/data/offers';

export const POST = route<{ offerId: string }, typeof offerDecisionSchema>({ body: offerDecisionSchema }, async ({ user, params, body }) => decideOffer(user.id, params.offerId, body));
