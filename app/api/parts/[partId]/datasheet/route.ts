import { route } from '@/lib/api/handler';
import { fileResponse, readUpload } from '@/lib/api/upload';
import { datasheetFile, deleteDatasheet, putDatasheet, requireDatasheetWriter } from '@/lib/data/parts';
import { MAX_DATASHEET_BYTES } from '@/lib/parts/schema';

type P = { partId: string };

/** The datasheet PDF as an attachment (every member of the part's team). */
export const GET = route<P>({}, async ({ user, params }) => {
  const f = await datasheetFile(user.id, params.partId);
  return fileResponse(f.bytes, 'application/pdf', f.fileName);
});

/** Upload or replace the datasheet: multipart field `file`, a PDF of at most 10 MiB (owners and designers). */
export const PUT = route<P>({}, async ({ req, user, params }) => {
  await requireDatasheetWriter(user.id, params.partId);
  const upload = await readUpload(req, MAX_DATASHEET_BYTES);
  return { part: await putDatasheet(user.id, params.partId, upload) };
});

/** Remove the datasheet (owners and designers). */
export const DELETE = route<P>({}, async ({ user, params }) => ({ part: await deleteDatasheet(user.id, params.partId) }));
