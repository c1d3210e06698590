/**
 * Hostile input against every route handler under app/api (found by walking the folder, so a
 * route added later is fuzzed without touching this file). Each exported method is called as the
 * fixture team's owner with adversarial requests — wrong content types, invalid JSON, deep
 * nesting, a 1.5 MB body (with and without a content-length), arrays for objects, huge numbers,
 * NaN/Infinity as strings, hostile query strings, path tricks and non-UUIDs in every path
 * parameter, multipart forms with evil file names — and every answer must be below 500, a 4xx
 * must be `{ error: { code, message } }`, no call may take longer than CALL_TIMEOUT_MS, and
 * afterwards the fixture design's revisions and their documents are byte-for-byte the same.
 *
 * A 500 names the route, the method and the case (and the seed: FUZZ_SEED reproduces it).
 */
import fs from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createDesign, saveRevision } from '@/lib/data/designs';
import { db } from '@/lib/db';
import { call, sampleDocument, setupFixtures, teardown, type AnyHandler, type CallOptions, type Fixtures } from './helpers';
import { deepJsonText, FUZZ_SEED, mutate, NASTY_NUMBERS, pick, randomBytes, randomValue, rng } from '../unit/fuzz/hostile';

const CALL_TIMEOUT_MS = 15_000;
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;
const ROOT = path.resolve(import.meta.dirname, '../../app/api');
const FILES = fs
  .readdirSync(ROOT, { recursive: true, encoding: 'utf8' })
  .filter((p) => p.endsWith('route.ts'))
  // next-auth's own handler reads Next's request scope (`cookies()`), which exists only inside a
  // running server: it is exercised through next-auth's core in tests/routes/security.test.ts and
  // over real HTTP by the load test (every client signs in through the credentials callback)
  .filter((p) => !p.includes('[...nextauth]'))
  .sort();

let f: Fixtures;
let designId: string;
let designRevisions = 0;
let totalCalls = 0;

interface Snapshot {
  revisions: string;
  design: string;
  members: string;
}

async function snapshot(): Promise<Snapshot> {
  const q = async (sql: string) => JSON.stringify((await db().sequelize.query(sql, { replacements: { designId, teamId: f.teamId } }))[0]);
  return {
    revisions: await q(`SELECT number, author_id, message, md5(document::text) AS doc FROM design_revisions WHERE design_id = :designId ORDER BY number`),
    design: await q(`SELECT latest_revision, topology, stages, visibility, archived_at, status, team_id, author_id FROM designs WHERE id = :designId`),
    members: await q(`SELECT user_id, role FROM memberships WHERE team_id = :teamId ORDER BY user_id`),
  };
}

let before: Snapshot;

beforeAll(async () => {
  f = await setupFixtures();
  const { design } = await createDesign(f.users.owner.id, f.teamId, { title: 'Fuzz target', visibility: 'team', document: sampleDocument() });
  designId = design.id;
  await saveRevision(f.users.owner.id, designId, { baseRevision: 1, document: sampleDocument(22e-9), message: 'second' });
  designRevisions = 2;
  before = await snapshot();
});
afterAll(teardown);

/** The folder names of `file` that are dynamic segments, e.g. ['teamId', 'userId']. */
function paramNames(file: string): string[] {
  return [...file.matchAll(/\[(\.\.\.)?([^\]]+)\]/g)].map((m) => (m[1] ? `...${m[2]}` : m[2]));
}

/** A fixture value for a path parameter: the fixture team and design, else a fresh unknown id. */
function fixtureParam(name: string): string | string[] {
  if (name.startsWith('...')) return ['x'];
  if (name === 'teamId') return f.teamId;
  if (name === 'designId') return designId;
  if (name === 'number') return String(designRevisions);
  if (name === 'token') return `tok${randomUUID().replace(/-/g, '')}`;
  return randomUUID();
}

const HOSTILE_PARAMS = [
  '../../etc/passwd',
  '..%2f..%2fetc%2fpasswd',
  '%2e%2e',
  '%2e%2e%2f%2e%2e%2f',
  '..',
  '.',
  '',
  'not-a-uuid',
  '00000000-0000-0000-0000-000000000000',
  'ffffffff-ffff-ffff-ffff-ffffffffffff',
  "1' OR '1'='1",
  '1e999',
  '-1',
  '0',
  'NaN',
  '\u0000',
  'x'.repeat(5000),
  '🔥',
];

interface FuzzCase {
  name: string;
  options: CallOptions;
  params?: Record<string, string | string[]>;
}

function evilForm(fileName: string, bytes: Uint8Array, type = 'application/pdf'): FormData {
  const form = new FormData();
  form.set('file', new File([bytes as BlobPart], fileName, { type }));
  form.set('title', '../../etc/passwd');
  return form;
}

function bodyCases(method: string, file: string): FuzzCase[] {
  const r = rng(FUZZ_SEED + file.length * 31 + method.length);
  const pdf = new TextEncoder().encode('%PDF-1.4\n%fuzz\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n');
  const cases: FuzzCase[] = [
    { name: 'text/plain body', options: { body: '{"title":"x"}', contentType: 'text/plain' } },
    { name: 'no content type', options: { body: new TextEncoder().encode('{"title":"x"}'), headers: { 'content-type': '' } } },
    { name: 'form-urlencoded', options: { body: 'title=x&document=1', contentType: 'application/x-www-form-urlencoded' } },
    { name: 'invalid JSON', options: { body: '{"title": "x",' } },
    { name: 'JSON with a BOM and trailing garbage', options: { body: '\ufeff{"a":1} trailing' } },
    { name: 'invalid UTF-8', options: { body: new Uint8Array([0x7b, 0x22, 0xff, 0xfe, 0x22, 0x7d]), contentType: 'application/json' } },
    { name: 'random bytes as JSON', options: { body: randomBytes(r, 2048), contentType: 'application/json' } },
    { name: 'deep array nesting (10 000)', options: { body: deepJsonText(10_000, 'array') } },
    { name: 'deep object nesting (10 000)', options: { body: deepJsonText(10_000, 'object') } },
    { name: '1.5 MB body', options: { body: JSON.stringify({ title: 'x'.repeat(1_500_000) }) } },
    { name: '1.5 MB body without content-length', options: { body: JSON.stringify({ document: 'x'.repeat(1_500_000) }), stream: true } },
    { name: 'array instead of object', options: { body: [] } },
    { name: 'array of objects', options: { body: [{ title: 'x' }] } },
    { name: 'null', options: { body: 'null' } },
    { name: 'a bare number', options: { body: '1e999' } },
    { name: 'a bare string', options: { body: '"NaN"' } },
    {
      name: 'huge and non-finite numbers in every usual field',
      options: {
        body: `{"baseRevision":1e999,"revision":-1e999,"number":1e308,"limit":1e999,"title":1e999,"role":1e999,"document":{"schemaVersion":1e999,"blocks":[],"wires":[]},"decision":-0}`,
      },
    },
    {
      name: 'NaN and Infinity as strings',
      options: { body: { baseRevision: 'NaN', revision: 'Infinity', parentBaseRevision: '-Infinity', number: '1e999', limit: 'NaN', document: 'NaN', title: 'NaN', role: 'owner ' } },
    },
    { name: 'prototype keys', options: { body: '{"__proto__":{"isAdmin":true},"constructor":{"prototype":{"x":1}},"title":"proto"}' } },
    { name: 'stale save of a valid document', options: { body: { baseRevision: 1, document: sampleDocument(47e-9), message: 'stale' } } },
  ];
  const saveBody = { baseRevision: 1, document: sampleDocument(), message: 'fuzz', title: 'Fuzz', revision: 1 };
  for (let i = 0; i < 6; i++) {
    // a mutated valid body: stays stale (base 1, latest is 2) so a save can never land
    const m = mutate(r, saveBody) as Record<string, unknown>;
    if (m && typeof m === 'object' && !Array.isArray(m)) m.baseRevision = pick(r, [1, ...NASTY_NUMBERS.filter((n) => n !== designRevisions), 'NaN', '1']);
    cases.push({ name: `mutated body #${i}`, options: { body: JSON.stringify(m) ?? 'null' } });
    cases.push({ name: `random value #${i}`, options: { body: JSON.stringify(randomValue(r)) ?? '{}' } });
  }
  for (const name of ['../../etc/passwd', '..\\..\\boot.ini', '%2e%2e%2fetc%2fpasswd.pdf', 'a\u0000b.pdf', '<script>alert(1)</script>.pdf', 'x'.repeat(4000) + '.pdf', '.htaccess', 'CON.pdf', '\u202egnp.exe', '']) {
    cases.push({ name: `multipart file named ${JSON.stringify(name.slice(0, 40))}`, options: { body: evilForm(name, pdf) } });
  }
  cases.push({ name: 'multipart with an HTML file declared as PDF', options: { body: evilForm('report.pdf', new TextEncoder().encode('<html><script>alert(1)</script></html>')) } });
  cases.push({ name: 'multipart 1.5 MB', options: { body: evilForm('big.pdf', randomBytes(r, 1_500_000)) } });
  cases.push({ name: 'multipart with a broken boundary', options: { body: '--x\r\nContent-Disposition: form-data; name="file"; filename="../a"\r\n\r\nabc', contentType: 'multipart/form-data; boundary=y' } });
  return cases;
}

function queryCases(): FuzzCase[] {
  const q = (query: Record<string, string>): CallOptions => ({ query });
  return [
    { name: 'hostile query: huge limit, NaN, negative', options: q({ limit: '1e999', before: 'NaN', offset: '-1', page: 'Infinity', revision: '-0' }) },
    { name: 'hostile query: path tricks and unicode', options: q({ teamId: '../../etc/passwd', designId: '%2e%2e', q: '🔥\u0000', sort: '__proto__', kind: "' OR 1=1 --" }) },
    { name: 'hostile query: 5 000 character values', options: q({ q: 'x'.repeat(5000), search: 'y'.repeat(5000), a: 'NaN' }) },
    { name: 'hostile query: dates and numbers', options: q({ before: '1e999', after: '9999-99-99T99:99:99Z', from: '-Infinity', to: 'NaN', a: String(Number.MAX_SAFE_INTEGER + 2) }) },
  ];
}

async function within<T>(p: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${what}: no answer within ${ms} ms`)), ms);
  });
  try {
    return await Promise.race([p, timeout]);
  } finally {
    clearTimeout(timer);
  }
}

function urlFor(file: string, params: Record<string, string | string[]>): string {
  const dir = path.dirname(file).split(path.sep).join('/');
  const segs = dir.split('/').map((seg) => {
    const m = /^\[(\.\.\.)?([^\]]+)\]$/.exec(seg);
    if (!m) return seg;
    const v = params[m[1] ? `...${m[2]}` : m[2]];
    return Array.isArray(v) ? v.map(encodeURIComponent).join('/') : encodeURIComponent(v);
  });
  return `/api/${segs.join('/')}`;
}

describe(`every route handler under hostile input (seed ${FUZZ_SEED})`, () => {
  it('finds the route files', () => {
    expect(FILES.length).toBeGreaterThanOrEqual(28);
  });

  it.each(FILES)('%s', async (file) => {
    const mod = (await import(path.join(ROOT, file))) as Record<string, unknown>;
    const names = paramNames(file);
    const problems: string[] = [];
    const errorLog = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    let calls = 0;
    try {
      for (const method of METHODS) {
        const handler = mod[method] as AnyHandler | undefined;
        if (typeof handler !== 'function') continue;
        const base = Object.fromEntries(names.map((n) => [n, fixtureParam(n)]));
        const cases: FuzzCase[] = method === 'GET' ? queryCases() : bodyCases(method, file);
        if (method === 'GET' || method === 'DELETE') cases.push({ name: 'plain call', options: {} });
        for (const n of names.filter((x) => !x.startsWith('...'))) {
          for (const bad of HOSTILE_PARAMS) {
            cases.push({ name: `param ${n}=${JSON.stringify(bad.slice(0, 30))}`, params: { ...base, [n]: bad }, options: method === 'GET' || method === 'DELETE' ? {} : { body: {} } });
          }
          if (n === 'teamId') cases.push({ name: "another team's id", params: { ...base, teamId: f.otherTeamId }, options: method === 'GET' || method === 'DELETE' ? {} : { body: {} } });
        }
        for (const c of cases) {
          // DELETE never names the fixture design: a valid delete is not hostile input
          const params = c.params ?? (method === 'DELETE' ? Object.fromEntries(names.map((n) => [n, n === 'teamId' ? f.teamId : fixtureParam(n === 'designId' ? 'other' : n)])) : base);
          const where = `${method} ${file} — ${c.name}`;
          calls++;
          const flatParams = Object.fromEntries(Object.entries(params).map(([k, v]) => [k.replace(/^\.\.\./, ''), v])) as Record<string, string>;
          let res;
          try {
            res = await within(call(handler, urlFor(file, params), { ...c.options, method, params: flatParams, as: f.users.owner }), CALL_TIMEOUT_MS, where);
          } catch (e) {
            problems.push(`${where}: ${(e as Error).message}`);
            continue;
          }
          if (res.status >= 500) {
            problems.push(`${where}: ${res.status} ${JSON.stringify(res.body).slice(0, 200)} | log: ${errorLog.mock.calls.map((a) => String(a[0]).slice(0, 300)).join(' / ')}`);
          } else if (res.status >= 400) {
            const err = (res.body as { error?: { code?: unknown; message?: unknown } }).error;
            if (typeof err?.code !== 'string' || typeof err?.message !== 'string') problems.push(`${where}: ${res.status} without { error: { code, message } }: ${JSON.stringify(res.body).slice(0, 200)}`);
          }
          errorLog.mockClear();
        }
      }
    } finally {
      errorLog.mockRestore();
    }
    totalCalls += calls;
    if (problems.length) throw new Error(`[fuzz seed ${FUZZ_SEED}] ${problems.length} of ${calls} calls failed:\n${problems.join('\n')}`);
    expect(calls).toBeGreaterThan(0);
  }, 180_000);

  it('left the fixture design, its revisions and the team exactly as they were', async () => {
    console.info(`[fuzz] ${FILES.length} route files, ${totalCalls} hostile calls`);
    expect(await snapshot()).toEqual(before);
  });
});
