import { z } from 'zod';
import { route } from '@/lib/api/handler';
import { fileResponse } from '@/lib/api/upload';
import { exportRevision } from '@/lib/data/exports';
import { EXPORT_FORMATS } from '@/lib/exports/files';

const querySchema = z.object({
  format: z.enum(EXPORT_FORMATS, { message: `format must be one of ${EXPORT_FORMATS.join(', ')}` }),
});

/**
 * Download revision `number` as `?format=bom` (CSV), `netlist` (SPICE-subset text), `json` (the
 * design document) or `pdf` (the design report). Everyone who can read the design; outsiders 404.
 */
export const GET = route<{ designId: string; number: string }, undefined, typeof querySchema>({ query: querySchema }, async ({ user, params, query }) => {
  const file = await exportRevision(user.id, params.designId, params.number, query.format);
  return fileResponse(file.body, file.contentType, file.fileName);
});
