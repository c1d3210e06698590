import { route } from '@/lib/api/handler';
import { getPartsPolicy, setPartsPolicy } from '@/lib/data/parts';
import { partsPolicySchema } from '@/lib/parts/schema';

type P = { teamId: string };

/** The team's derating policy (every member). */
export const GET = route<P>({}, async ({ user, params }) => ({ policy: await getPartsPolicy(user.id, params.teamId) }));

/** Set the derating policy (owners only). */
export const PUT = route<P, typeof partsPolicySchema>({ body: partsPolicySchema }, async ({ user, params, body }) => ({
  policy: await setPartsPolicy(user.id, params.teamId, body),
}));
