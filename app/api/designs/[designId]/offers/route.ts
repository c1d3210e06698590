import { offerBackSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { createOffer, listOffers } from '@/lib/data/offers';

type P = { designId: string };

export const GET = route<P>({}, async ({ user, params }) => listOffers(user.id, params.designId));

export const POST = route<P, typeof offerBackSchema>({ body: offerBackSchema, status: 201 }, async ({ user, params, body }) => createOffer(user.id, params.designId, body));
