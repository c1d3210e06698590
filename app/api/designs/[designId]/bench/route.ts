import { route } from '@/lib/api/handler';
import { readUpload } from '@/lib/api/upload';
import { answeringCsvErrors, benchFields, createBenchDataset, listBenchDatasets, MAX_BENCH_FILE_BYTES, requireBenchWriter } from '@/lib/data/bench';

type P = { designId: string };

/** The design's bench datasets (every member who can read the design). */
export const GET = route<P>({}, async ({ user, params }) => ({ datasets: await listBenchDatasets(user.id, params.designId) }));

/** Upload a CSV (`file`) with its `mapping` (JSON), `name`, optional `notes` and `revision` (owners, designers). */
export const POST = route<P>({ status: 201 }, async ({ req, user, params }) => {
  await requireBenchWriter(user.id, params.designId);
  const clone = req.clone();
  const upload = await readUpload(req, MAX_BENCH_FILE_BYTES);
  const fields = await benchFields(clone);
  return answeringCsvErrors(async () => ({ dataset: await createBenchDataset(user.id, params.designId, upload, fields) }));
});
