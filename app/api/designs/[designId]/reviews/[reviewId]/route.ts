import { route } from '@/lib/api/handler';
import { withdrawReview } from '@/lib/data/reviews';

export const DELETE = route<{ designId: string; reviewId: string }>({}, async ({ user, params }) => withdrawReview(user.id, params.designId, params.reviewId));
