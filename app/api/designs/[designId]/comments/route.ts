import { commentListQuerySchema, createCommentSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { createComment, listComments } from '@/lib/data/comments';

type P = { designId: string };

export const GET = route<P, undefined, typeof commentListQuerySchema>({ query: commentListQuerySchema }, async ({ user, params, query }) => ({
  comments: await listComments(user.id, params.designId, query),
}));

export const POST = route<P, typeof createCommentSchema>({ body: createCommentSchema, status: 201 }, async ({ user, params, body }) => ({
  comment: await createComment(user.id, params.designId, body),
}));
