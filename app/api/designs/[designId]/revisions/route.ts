import { saveRevisionSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { listRevisions, saveRevision } from '@/lib/data/designs';

type P = { designId: string };

export const GET = route<P>({}, async ({ user, params }) => ({
  revisions: await listRevisions(user.id, params.designId),
}));

export const POST = route<P, typeof saveRevisionSchema>({ body: saveRevisionSchema, status: 201 }, async ({ user, params, body }) => ({
  revision: await saveRevision(user.id, params.designId, body),
}));
