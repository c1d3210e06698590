import { route } from '@/lib/api/handler';
import { withdrawOffer } from '@/lib/data/offers';

export const DELETE = route<{ offerId: string }>({}, async ({ user, params }) => withdrawOffer(user.id, params.offerId));
