import { describe, expect, it } from 'vitest';
import { fileResponse, looksLikePdf, readUpload, safeFileName } from '@/lib/api/upload';
import { AppError } from '@/lib/errors';

function formRequest(form: FormData): Request {
  return new Request('http://127.0.0.1/x', { method: 'POST', body: form });
}

async function failure(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof AppError) return e;
    throw e;
  }
  throw new Error('expected a refusal');
}

describe('safeFileName', () => {
  it.each([
    ['../../etc/passwd', 'passwd'],
    ['C:\\Users\\x\\sheet.pdf', 'sheet.pdf'],
    ['..hidden.pdf', 'hidden.pdf'],
    ['a"b<c>.pdf', 'abc.pdf'],
    ['line\nbreak.csv', 'linebreak.csv'],
    ['', 'upload'],
    ['../', 'upload'],
  ])('%j → %j', (raw, want) => {
    expect(safeFileName(raw)).toBe(want);
  });
  it('keeps at most 120 characters', () => {
    expect(safeFileName('x'.repeat(500))).toHaveLength(120);
  });
});

describe('readUpload', () => {
  it('reads the named field with a safe name', async () => {
    const form = new FormData();
    form.set('file', new File([new Uint8Array([37, 80, 68, 70, 45, 49])], '../evil/../sheet.pdf', { type: 'application/pdf' }));
    const u = await readUpload(formRequest(form), 1000);
    expect(u.fileName).toBe('sheet.pdf');
    expect(u.bytes).toHaveLength(6);
    expect(looksLikePdf(u.bytes)).toBe(true);
  });
  it('refuses a JSON body with 415', async () => {
    const e = await failure(readUpload(new Request('http://127.0.0.1/x', { method: 'POST', body: '{}', headers: { 'content-type': 'application/json' } }), 1000));
    expect(e.status).toBe(415);
  });
  it('refuses a missing or empty file with 422', async () => {
    const none = new FormData();
    none.set('other', 'x');
    expect((await failure(readUpload(formRequest(none), 1000))).status).toBe(422);
    const empty = new FormData();
    empty.set('file', new File([], 'a.pdf'));
    expect((await failure(readUpload(formRequest(empty), 1000))).status).toBe(422);
  });
  it('refuses a file over the limit with 413', async () => {
    const form = new FormData();
    form.set('file', new File([new Uint8Array(5000)], 'big.pdf'));
    expect((await failure(readUpload(formRequest(form), 1000))).status).toBe(413);
    const huge = new FormData();
    huge.set('file', new File([new Uint8Array(200_000)], 'huge.pdf'));
    expect((await failure(readUpload(formRequest(huge), 1000))).status).toBe(413);
  });
});

describe('fileResponse', () => {
  it('is an attachment with nosniff and a sandbox policy', () => {
    const r = fileResponse('a,b\n', 'text/csv; charset=utf-8', 'bom "r3".csv');
    expect(r.headers.get('content-disposition')).toBe(`attachment; filename="bom r3.csv"; filename*=UTF-8''bom%20r3.csv`);
    expect(r.headers.get('x-content-type-options')).toBe('nosniff');
    expect(r.headers.get('content-security-policy')).toContain('sandbox');
  });
  it('is not fooled by a non-PDF', () => {
    expect(looksLikePdf(new TextEncoder().encode('<html>'))).toBe(false);
  });
});
