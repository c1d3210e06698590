import { updateDesignSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { getDesign, updateDesign } from '@/lib/data/designs';

type P = { designId: string };

export const GET = route<P>({}, async ({ user, params }) => getDesign(user.id, params.designId));

export const PATCH = route<P, typeof updateDesignSchema>({ body: updateDesignSchema }, async ({ user, params, body }) => ({
  design: await updateDesign(user.id, params.designId, body),
}));
