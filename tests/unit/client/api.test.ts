import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, fieldError, formError, routeUrl } from '@/lib/client/api';

afterEach(() => vi.unstubAllGlobals());

function stubFetch(status: number, body: string) {
  const calls: { url: string; init: RequestInit }[] = [];
  vi.stubGlobal('fetch', async (url: string, init: RequestInit) => {
    calls.push({ url, init });
    return new Response(body, { status, headers: { 'content-type': 'application/json' } });
  });
  return calls;
}

describe('routeUrl', () => {
  it('fills path params (encoded) and drops empty query values', () => {
    expect(routeUrl('GET /api/designs/:designId/revisions/:number', { designId: 'a b', number: '3' })).toBe('/api/designs/a%20b/revisions/3');
    expect(routeUrl('GET /api/teams/:teamId/designs', { teamId: 't1' }, { q: 'bias', sort: undefined, archived: '' })).toBe('/api/teams/t1/designs?q=bias');
  });
});

describe('api', () => {
  it('sends JSON with the route method and returns the body', async () => {
    const calls = stubFetch(201, JSON.stringify({ team: { id: 't', name: 'N', role: 'owner', memberCount: 1 } }));
    const res = await api('POST /api/teams', { body: { name: 'N' } });
    expect(res.team.id).toBe('t');
    expect(calls[0].url).toBe('/api/teams');
    expect(calls[0].init.method).toBe('POST');
    expect(calls[0].init.body).toBe('{"name":"N"}');
  });

  it('turns the error body into an ApiError with code, field and latestRevision', async () => {
    stubFetch(409, JSON.stringify({ error: { code: 'conflict', message: 'stale', field: 'baseRevision', latestRevision: 4 } }));
    const err = await api('POST /api/designs/:designId/revisions', { params: { designId: 'd' }, body: {} }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect(err).toMatchObject({ status: 409, code: 'conflict', message: 'stale', field: 'baseRevision', latestRevision: 4 });
  });

  it('gives a typed error for a non-JSON failure and for a network failure', async () => {
    stubFetch(502, '<html>bad gateway</html>');
    await expect(api('GET /api/me')).rejects.toMatchObject({ status: 502, code: 'http_502' });
    vi.stubGlobal('fetch', async () => {
      throw new TypeError('Failed to fetch');
    });
    await expect(api('GET /api/me')).rejects.toMatchObject({ status: 0, code: 'network' });
  });
});

describe('fieldError / formError', () => {
  const err = new ApiError(422, { code: 'invalid', message: 'email: Invalid email address', field: 'email' });
  it('puts a field error under its field without the prefix, and not at the top', () => {
    expect(fieldError(err, 'email')).toBe('Invalid email address');
    expect(fieldError(err, 'name')).toBeUndefined();
    expect(formError(err, ['email'])).toBeUndefined();
    expect(formError(err, ['name'])).toBe('email: Invalid email address');
    expect(formError(null)).toBeUndefined();
  });
});
