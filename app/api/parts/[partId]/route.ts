import { route } from '@/lib/api/handler';
import { deletePart, getPart, replacePart } from '@/lib/data/parts';
import { partInputSchema } from '@/lib/parts/schema';

type P = { partId: string };

/** One part (every member of its team). */
export const GET = route<P>({}, async ({ user, params }) => ({ part: await getPart(user.id, params.partId) }));

/** Replace the part with the whole body (owners and designers). */
export const PATCH = route<P, typeof partInputSchema>({ body: partInputSchema }, async ({ user, params, body }) => ({
  part: await replacePart(user.id, params.partId, body),
}));

/** Delete the part and its datasheet (owners and designers). Designs bound to it keep their copied values. */
export const DELETE = route<P>({}, async ({ user, params }) => {
  await deletePart(user.id, params.partId);
  return { deleted: true };
});
