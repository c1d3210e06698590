import { route } from '@/lib/api/handler';
import { auditQuerySchema, listAudit } from '@/lib/data/audit';

/** The team's audit log, newest first (owners only): `?limit=&before=<id>&action=`. */
export const GET = route<{ teamId: string }, undefined, typeof auditQuerySchema>({ query: auditQuerySchema }, async ({ user, params, query }) =>
  listAudit(user.id, params.teamId, query),
);
