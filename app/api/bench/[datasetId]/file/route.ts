import { route } from '@/lib/api/handler';
import { fileResponse } from '@/lib/api/upload';
import { benchFile } from '@/lib/data/bench';

/** The raw CSV as uploaded (an attachment; every member who can read the design). */
export const GET = route<{ datasetId: string }>({}, async ({ user, params }) => {
  const f = await benchFile(user.id, params.datasetId);
  return fileResponse(f.bytes, 'text/csv', f.fileName);
});
