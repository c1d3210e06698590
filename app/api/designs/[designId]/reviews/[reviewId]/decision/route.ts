import { reviewDecisionSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { decideReview } from '@/lib/data/reviews';

export const POST = route<{ designId: string; reviewId: string }, typeof reviewDecisionSchema>({ body: reviewDecisionSchema }, async ({ user, params, body }) =>
  decideReview(user.id, params.designId, params.reviewId, body),
);
