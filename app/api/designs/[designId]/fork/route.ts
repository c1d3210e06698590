import { forkSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { forkDesign } from '@/lib/data/designs';

export const POST = route<{ designId: string }, typeof forkSchema>({ body: forkSchema, status: 201 }, async ({ user, params, body }) => ({
  design: await forkDesign(user.id, params.designId, body),
}));
