import { route } from '@/lib/api/handler';
import { z } from '@/lib/circuit/zod';
import { deleteBenchDataset, getBenchDataset } from '@/lib/data/bench';

type P = { datasetId: string };

const query = z.object({ revision: z.coerce.number().int().min(1).max(1_000_000).optional() });

/** The dataset, its points and the model comparison for `?revision=N` (default: the dataset's revision). */
export const GET = route<P, undefined, typeof query>({ query }, async ({ user, params, query: q }) => getBenchDataset(user.id, params.datasetId, q.revision));

/** Delete the dataset and its raw file (owners, designers). */
export const DELETE = route<P>({}, async ({ user, params }) => {
  await deleteBenchDataset(user.id, params.datasetId);
  return { deleted: true };
});
