import { route } from '@/lib/api/handler';
import { importParts } from '@/lib/data/parts';
import { partImportSchema } from '@/lib/parts/schema';

type P = { teamId: string };

/** Import a parts-list CSV (JSON `{ csv, dryRun }`; owners and designers) → the import report. */
export const POST = route<P, typeof partImportSchema>({ body: partImportSchema }, async ({ user, params, body }) => importParts(user.id, params.teamId, body));
