import { route } from '@/lib/api/handler';
import { readUpload } from '@/lib/api/upload';
import { answeringCsvErrors, inspectBenchFile, MAX_BENCH_FILE_BYTES, requireBenchWriter } from '@/lib/data/bench';

/** The layout of an uploaded CSV (`file`) and a suggested column mapping; stores nothing (owners, designers). */
export const POST = route<{ designId: string }>({}, async ({ req, user, params }) => {
  await requireBenchWriter(user.id, params.designId);
  const upload = await readUpload(req, MAX_BENCH_FILE_BYTES);
  return answeringCsvErrors(async () => ({ inspect: await inspectBenchFile(user.id, params.designId, upload) }));
});
