/**
 * File uploads and downloads for route handlers. An upload is one `multipart/form-data` field
 * (default `file`) read with a byte limit before parsing (413 above it), its name reduced to a safe
 * base name (no folders, no `..`, no control characters) and its type checked by the route. A
 * download is always `attachment` with a fixed content type and `nosniff`, so a stored file is never
 * rendered or executed by the browser as a page of ours.
 */
import { AppError, invalid } from '../errors';
import { readBodyBytes } from './handler';

/** One uploaded file. */
export interface Upload {
  /** Safe base name for display and download (see `safeFileName`). */
  fileName: string;
  /** The type the browser declared (not trusted: routes check the bytes). */
  declaredType: string;
  bytes: Uint8Array;
}

/** A base name without folders, control characters or characters that break headers; never empty. */
export function safeFileName(raw: string, fallback = 'upload'): string {
  const base = raw.replace(/\\/g, '/').split('/').pop() ?? '';
  const cleaned = base
    .normalize('NFKC')
    // eslint-disable-next-line no-control-regex -- removing control characters is the point
    .replace(/[\u0000-\u001f\u007f"<>|:*?;]/g, '')
    .replace(/^\.+/, '')
    .trim()
    .slice(0, 120);
  return cleaned === '' ? fallback : cleaned;
}

/**
 * Read the file in form field `field` of a multipart request. The whole body is limited to
 * `maxBytes` plus 64 KiB for the form's own framing. Errors: 415 when the request is not a form,
 * 422 (field `file`) when the field is missing or empty, 413 when too large.
 */
export async function readUpload(req: Request, maxBytes: number, field = 'file'): Promise<Upload> {
  const type = (req.headers.get('content-type') ?? '').toLowerCase();
  if (!type.startsWith('multipart/form-data')) throw new AppError('unsupported_media_type', 'send the file as multipart/form-data');
  const body = await readBodyBytes(req, maxBytes + 65_536);
  let form: FormData;
  try {
    form = await new Response(body as BodyInit, { headers: { 'content-type': req.headers.get('content-type') ?? '' } }).formData();
  } catch {
    throw new AppError('bad_json', 'the form could not be read');
  }
  const value = form.get(field);
  if (value === null || typeof value === 'string') throw invalid(`choose a file to upload (form field "${field}")`, field);
  const bytes = new Uint8Array(await value.arrayBuffer());
  if (bytes.byteLength === 0) throw invalid('the file is empty', field);
  if (bytes.byteLength > maxBytes) throw new AppError('payload_too_large', `the file is larger than ${Math.round(maxBytes / 1024)} KiB`);
  return { fileName: safeFileName(value.name), declaredType: value.type, bytes };
}

/** True when `bytes` start like a PDF file (`%PDF-`). */
export function looksLikePdf(bytes: Uint8Array): boolean {
  return bytes.length >= 5 && new TextDecoder().decode(bytes.subarray(0, 5)) === '%PDF-';
}

/** A download response: attachment, fixed type, nosniff, a sandboxing policy and no caching. */
export function fileResponse(body: Uint8Array | string, contentType: string, fileName: string): Response {
  const name = safeFileName(fileName, 'download');
  const ascii = name.replace(/[^\x20-\x7e]/g, '_');
  return new Response(body as BodyInit, {
    status: 200,
    headers: {
      'content-type': contentType,
      'content-disposition': `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`,
      'x-content-type-options': 'nosniff',
      'content-security-policy': "default-src 'none'; sandbox",
      'cache-control': 'private, no-store',
    },
  });
}
