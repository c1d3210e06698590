import { route } from '@/lib/api/handler';
import { createPart, listParts } from '@/lib/data/parts';
import { partInputSchema, partListQuerySchema } from '@/lib/parts/schema';

type P = { teamId: string };

/** The team's parts: `q` searches part number, description and maker; `kind`, `sort`, `dir` (every member). */
export const GET = route<P, undefined, typeof partListQuerySchema>({ query: partListQuerySchema }, async ({ user, params, query }) => ({
  parts: await listParts(user.id, params.teamId, query),
}));

/** Create a part (owners and designers); 409 `exists` when the part number is taken in the team. */
export const POST = route<P, typeof partInputSchema>({ body: partInputSchema, status: 201 }, async ({ user, params, body }) => ({
  part: await createPart(user.id, params.teamId, body),
}));
