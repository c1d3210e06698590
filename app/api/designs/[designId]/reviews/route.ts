import { requestReviewSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { listReviews, requestReview } from '@/lib/data/reviews';

type P = { designId: string };

export const GET = route<P>({}, async ({ user, params }) => listReviews(user.id, params.designId));

export const POST = route<P, typeof requestReviewSchema>({ body: requestReviewSchema, status: 201 }, async ({ user, params, body }) =>
  requestReview(user.id, params.designId, body),
);
