import { updateCommentSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { updateComment } from '@/lib/data/comments';

export const PATCH = route<{ commentId: string }, typeof updateCommentSchema>({ body: updateCommentSchema }, async ({ user, params, body }) => ({
  comment: await updateComment(user.id, params.commentId, body),
}));
