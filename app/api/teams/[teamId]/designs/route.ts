import { createDesignSchema, designListQuerySchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { createDesign, listDesigns } from '@/lib/data/designs';

type P = { teamId: string };

export const GET = route<P, undefined, typeof designListQuerySchema>({ query: designListQuerySchema }, async ({ user, params, query }) => ({
  designs: await listDesigns(user.id, params.teamId, query),
}));

export const POST = route<P, typeof createDesignSchema>({ body: createDesignSchema, status: 201 }, async ({ user, params, body }) =>
  createDesign(user.id, params.teamId, body),
);
