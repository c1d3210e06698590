/**
 * The parts client: datasheet uploads go out as multipart PUT with the field `file`, and the
 * server's error body (415 not a PDF, 413 too large) comes back as an ApiError the form shows;
 * the import report is read whether the route wraps it or not.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/client/api';
import { datasheetUrl, importReportOf, uploadDatasheet } from '@/lib/client/parts';

afterEach(() => vi.unstubAllGlobals());

function stubFetch(status: number, body: string) {
  const calls: { url: string; init: RequestInit }[] = [];
  vi.stubGlobal('fetch', async (url: string, init: RequestInit) => {
    calls.push({ url, init });
    return new Response(body, { status, headers: { 'content-type': 'application/json' } });
  });
  return calls;
}

describe('datasheets', () => {
  it('PUTs the file as multipart field `file` to the part’s datasheet route', async () => {
    const calls = stubFetch(200, JSON.stringify({ part: { id: 'p 1' } }));
    const file = new File([new Uint8Array([0x25, 0x50, 0x44, 0x46])], 'sheet.pdf', { type: 'application/pdf' });
    await uploadDatasheet('p 1', file);
    expect(datasheetUrl('p 1')).toBe('/api/parts/p%201/datasheet');
    expect(calls[0].url).toBe('/api/parts/p%201/datasheet');
    expect(calls[0].init.method).toBe('PUT');
    const form = calls[0].init.body as FormData;
    expect(form).toBeInstanceOf(FormData);
    expect((form.get('file') as File).name).toBe('sheet.pdf');
  });

  it('turns the server’s refusal into an ApiError with its message and field', async () => {
    stubFetch(415, JSON.stringify({ error: { code: 'unsupported', message: 'a datasheet must be a PDF', field: 'file' } }));
    const err = await uploadDatasheet('p', new File(['x'], 'a.txt')).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect(err).toMatchObject({ status: 415, code: 'unsupported', message: 'a datasheet must be a PDF', field: 'file' });
  });

  it('says what a bare 413 means', async () => {
    stubFetch(413, '');
    const err = await uploadDatasheet('p', new File(['x'], 'big.pdf')).catch((e: unknown) => e);
    expect(err).toMatchObject({ status: 413, message: 'The file is larger than 10 MB.' });
  });
});

describe('import report', () => {
  it('reads the report bare or wrapped', () => {
    const report = { created: 2, updated: 1, rejected: [{ line: 4, partNumber: 'X', reasons: ['capacitanceF: must be greater than zero'] }], dryRun: true };
    expect(importReportOf(report)).toBe(report);
    expect(importReportOf({ report })).toBe(report);
  });
});
