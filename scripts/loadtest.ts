/**
 * `npm run loadtest [-- options]`: many signed-in clients against the production build and a real
 * PostgreSQL on loopback, with autocannon (npm, pinned 9.0.0). Not part of `npm test`.
 *
 * What it does:
 * 1. Unless --url is given, starts `next start` (the build in .next must exist: `npx next build`)
 *    on --port with this shell's DATABASE_URL / NEXTAUTH_SECRET, and waits for /api/health.
 * 2. Creates a load-test team (invented: "Tallgrass Instruments load bench <time>"), one owner and
 *    --users designers (default: the largest client count), and --designs designs made through the
 *    API. Sessions are minted with next-auth's own `encode` and the server's NEXTAUTH_SECRET; three
 *    users also sign in for real through the credentials callback as a check.
 * 3. For each --clients count (default 50,200) runs autocannon for --duration seconds or --amount
 *    requests, whichever ends first. Every connection is one client cycling through a realistic
 *    session: list designs → open a design → save a revision on the base it opened (a 409 from a
 *    colleague's save is handled by re-opening, as the editor does) → read comments → comment →
 *    open again → save again → compare the design's latest revision with the one before (the
 *    compare page solves both on the server, in the solve pool; --no-solve leaves it out). Each
 *    cycle takes the next user and one of the designs, so saves on one design do collide. Every
 *    design starts with its own documents, and every save sends new capacitor values, so the
 *    compares ask for new solves, not answers the pool has kept.
 * 4. Prints requests/s, p50/p95/p99 per request kind, non-2xx answers and socket errors, then counts
 *    the revisions in the database and compares them with the saves that were answered 201 (they must
 *    be equal; the exit code is 1 when they are not).
 *
 * Options: --url URL --port N (default $E2E_PORT or 3716) --clients 50,200 --duration 20 --amount 40000
 *          --designs 20 --users N --mix full,nosolve (default full; --no-solve = nosolve) --timeout 10 (s per request)
 *          --rate R (requests per second from each client; default 0 = back to back, the server's ceiling)
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createRequire } from 'node:module';
import os from 'node:os';
import { encode } from 'next-auth/jwt';
import { Transaction } from 'sequelize';
import { closeDb, db } from '../lib/db';
import { hashPassword } from '../lib/auth/password';
import { halfWaveStarter } from '../lib/circuit/document/starters';
import { designDocumentSchema, type DesignDocument } from '../lib/circuit/document/schema';

// ---- options ----
const argv = process.argv.slice(2);
function opt(name: string, fallback: string): string {
  const i = argv.indexOf(`--${name}`);
  return i >= 0 && argv[i + 1] !== undefined ? argv[i + 1] : fallback;
}
const flag = (name: string) => argv.includes(`--${name}`);
const PORT = Number(opt('port', process.env.E2E_PORT ?? '3716'));
const EXTERNAL_URL = opt('url', '');
const BASE = (EXTERNAL_URL || `http://127.0.0.1:${PORT}`).replace(/\/$/, '');
const CLIENTS = opt('clients', '50,200').split(',').map(Number).filter((n) => n > 0);
const DURATION_S = Number(opt('duration', '20'));
const AMOUNT = Number(opt('amount', '40000'));
const DESIGNS = Number(opt('designs', '20'));
const USERS = Number(opt('users', String(Math.max(...CLIENTS))));
/** Session mixes to run, each at every client count: `full` (with the compare solve) and/or `nosolve`. */
const MIXES = (flag('no-solve') ? 'nosolve' : opt('mix', 'full')).split(',').filter((m) => m === 'full' || m === 'nosolve');
const TIMEOUT_S = Number(opt('timeout', '10'));
/**
 * Requests per second from each client (autocannon's connectionRate, one instance per client with
 * staggered starts, each client beginning at a different step of the session): 0 = back to back,
 * a stress test of the server's ceiling; 1 = a client that asks once a second, brisker than a
 * person at the editor (a save, a comment or a compare is seconds of work apart). Paced phases
 * run for --duration (no --amount cap).
 */
const RATE = Number(opt('rate', '0'));
if (!Number.isFinite(RATE) || RATE < 0) throw new Error('--rate: requests per second per client, 0 or more');

if (!process.env.DATABASE_URL) throw new Error('set DATABASE_URL (source scripts/env.sh) to the database the server uses');
if (!process.env.NEXTAUTH_SECRET) throw new Error('set NEXTAUTH_SECRET (source scripts/env.sh): sessions are minted with the server secret');
if (!EXTERNAL_URL) process.env.NEXTAUTH_URL = BASE;

// ---- autocannon (CommonJS, no bundled types: the part used here) ----
interface AcRequest {
  method?: string;
  path?: string;
  headers?: Record<string, string>;
  body?: string;
}
interface AcRequestSpec {
  setupRequest: (req: AcRequest, context: Ctx) => AcRequest;
  onResponse: (status: number, body: string, context: Ctx) => void;
}
interface AcResult {
  requests: { average: number; total: number; sent: number };
  latency: { p50: number; p97_5: number; p99: number };
  errors: number;
  timeouts: number;
  non2xx: number;
  duration: number;
  '2xx': number;
}
type Autocannon = (o: Record<string, unknown>) => Promise<AcResult>;
const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

// ---- per-kind timing ----
type Kind = 'list' | 'open' | 'save' | 'comments' | 'comment' | 'solve';
const KINDS: Kind[] = ['list', 'open', 'save', 'comments', 'comment', 'solve'];
interface KindStats {
  ms: number[];
  status: Map<number, number>;
}
let stats: Record<Kind, KindStats>;
function resetStats() {
  stats = Object.fromEntries(KINDS.map((k) => [k, { ms: [], status: new Map() }])) as unknown as Record<Kind, KindStats>;
}
let saved201 = 0;
/** Messages of the saves answered 201 (each save's message is unique). */
const savedMessages = new Set<string>();
let saved409 = 0;

interface Ctx {
  message?: string;
  user?: number;
  design?: number;
  base?: number;
  t0?: bigint;
  kind?: Kind;
}

function pct(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
}

// ---- server ----
let server: ChildProcess | null = null;
async function waitHealthy(ms: number): Promise<void> {
  const until = Date.now() + ms;
  for (;;) {
    try {
      const res = await fetch(`${BASE}/api/health`);
      if (res.ok) return;
    } catch {
      // not up yet
    }
    if (Date.now() > until) throw new Error(`${BASE}/api/health did not answer 200 within ${ms} ms`);
    await new Promise((r) => setTimeout(r, 300));
  }
}
async function startServer(): Promise<void> {
  server = spawn('node_modules/.bin/next', ['start', '-H', '127.0.0.1', '-p', String(PORT)], {
    env: { ...process.env, NODE_ENV: 'production', NEXTAUTH_URL: BASE },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  server.stderr?.on('data', (d: Buffer) => process.stderr.write(`[next] ${d.toString()}`));
  await waitHealthy(60_000);
}

// ---- fixtures ----
interface Fixture {
  teamId: string;
  designIds: string[];
  cookies: string[];
  owner: string;
}

function doc(capacitanceF: number): DesignDocument {
  return designDocumentSchema.parse(halfWaveStarter(3, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF, loadCurrentA: 1e-4 }));
}

async function cookieFor(u: { id: string; name: string; email: string }): Promise<string> {
  const token = await encode({ token: { sub: u.id, name: u.name, email: u.email }, secret: process.env.NEXTAUTH_SECRET! });
  const secure = BASE.startsWith('https://');
  return `${secure ? '__Secure-' : ''}next-auth.session-token=${token}`;
}

async function setup(): Promise<Fixture> {
  const { Team, User, Membership } = db().models;
  const stamp = new Date().toISOString().replace(/[-:.TZ]/g, '').slice(0, 14);
  const team = await Team.create({ name: `Tallgrass Instruments load bench ${stamp}` });
  const passwordHash = await hashPassword(`load-${stamp}-password`);
  const mk = async (name: string, role: 'owner' | 'designer') => {
    const u = await User.create({ name, email: `${name.toLowerCase().replace(/\s+/g, '.')}.${stamp}@loadbench.test`, passwordHash, emailVerified: null, image: null });
    await Membership.create({ teamId: team.id, userId: u.id, role });
    return { id: u.id, name, email: u.email };
  };
  const owner = await mk('Load Owner', 'owner');
  const users = [];
  for (let i = 0; i < USERS; i++) users.push(await mk(`Load Designer ${i + 1}`, 'designer'));
  const cookies = await Promise.all(users.map(cookieFor));
  const ownerCookie = await cookieFor(owner);
  const designIds: string[] = [];
  for (let i = 0; i < DESIGNS; i++) {
    const res = await fetch(`${BASE}/api/teams/${team.id}/designs`, {
      method: 'POST',
      headers: { cookie: ownerCookie, 'content-type': 'application/json' },
      // each design its own capacitors, so no two designs share a solve
      body: JSON.stringify({ title: `Load ladder ${i + 1}`, document: doc((10 + i) * 1e-9), message: 'load test start' }),
    });
    if (res.status !== 201) throw new Error(`creating a design answered ${res.status}: ${await res.text()}`);
    designIds.push(((await res.json()) as { design: { id: string } }).design.id);
  }
  // a second revision on each, so the compare page has two revisions to solve
  for (const [i, id] of designIds.entries()) {
    const res = await fetch(`${BASE}/api/designs/${id}/revisions`, {
      method: 'POST',
      headers: { cookie: ownerCookie, 'content-type': 'application/json' },
      body: JSON.stringify({ baseRevision: 1, document: doc((40 + i) * 1e-9), message: 'bigger capacitors' }),
    });
    if (res.status !== 201) throw new Error(`second revision answered ${res.status}`);
  }
  // three real sign-ins through next-auth's credentials callback
  for (const u of users.slice(0, 3)) {
    const csrfRes = await fetch(`${BASE}/api/auth/csrf`);
    const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
    const jar = csrfRes.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const res = await fetch(`${BASE}/api/auth/callback/credentials`, {
      method: 'POST',
      redirect: 'manual',
      headers: { cookie: jar, 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken, email: u.email, password: `load-${stamp}-password`, callbackUrl: `${BASE}/designs`, json: 'true' }),
    });
    const session = res.headers.getSetCookie().find((c) => /next-auth\.session-token=/.test(c));
    if (!session) throw new Error(`sign-in through the credentials callback gave no session cookie (${res.status})`);
    const me = await fetch(`${BASE}/api/me`, { headers: { cookie: session.split(';')[0] } });
    if (me.status !== 200) throw new Error(`/api/me with the signed-in cookie answered ${me.status}`);
  }
  console.log(`[load] team ${team.id}: ${USERS} designers, ${DESIGNS} designs (2 revisions each); 3 real sign-ins checked`);
  return { teamId: team.id, designIds, cookies, owner: ownerCookie };
}

// ---- the session every connection cycles through ----
let nextUser = 0;
/** Save counter across the warm-up and every phase: each save's message is unique. */
let seq = 0;
function requests(fx: Fixture, solve: boolean, client = 0): AcRequestSpec[] {
  const designOf = (c: Ctx) => fx.designIds[c.design!];
  const start = (c: Ctx, kind: Kind) => {
    // the first request of a pass through the session (autocannon starts each pass with a fresh
    // context) takes the next user, and with it one of the designs
    if (c.user === undefined) {
      c.user = nextUser++ % fx.cookies.length;
      c.design = c.user % fx.designIds.length;
    }
    c.kind = kind;
    c.t0 = process.hrtime.bigint();
  };
  const done = (status: number, c: Ctx) => {
    if (!c.kind || c.t0 === undefined) return;
    const s = stats[c.kind];
    s.ms.push(Number(process.hrtime.bigint() - c.t0) / 1e6);
    s.status.set(status, (s.status.get(status) ?? 0) + 1);
  };
  const json = { 'content-type': 'application/json' };
  const h = (c: Ctx, extra: Record<string, string> = {}) => ({ cookie: fx.cookies[c.user!], ...extra });
  const open: AcRequestSpec = {
    setupRequest: (req, c) => {
      start(c, 'open');
      return { ...req, method: 'GET', path: `/api/designs/${designOf(c)}`, headers: h(c) };
    },
    onResponse: (status, body, c) => {
      done(status, c);
      if (status === 200) c.base = (JSON.parse(body) as { design: { latestRevision: number } }).design.latestRevision;
    },
  };
  const save: AcRequestSpec = {
    setupRequest: (req, c) => {
      start(c, 'save');
      seq++;
      c.message = `load save ${seq}`;
      return {
        ...req,
        method: 'POST',
        path: `/api/designs/${designOf(c)}/revisions`,
        headers: h(c, json),
        body: JSON.stringify({ baseRevision: c.base ?? 1, document: doc((1 + (seq % 997)) * 1e-10), message: c.message }),
      };
    },
    onResponse: (status, body, c) => {
      done(status, c);
      if (status === 201) {
        saved201++;
        savedMessages.add(c.message!);
        c.base = (JSON.parse(body) as { revision: { number: number } }).revision.number;
      } else if (status === 409) saved409++; // a colleague saved first: the next step re-opens
    },
  };
  const list: AcRequestSpec[] = [
    {
      setupRequest: (req, c) => {
        start(c, 'list');
        return { ...req, method: 'GET', path: `/api/teams/${fx.teamId}/designs`, headers: h(c) };
      },
      onResponse: (status, _b, c) => done(status, c),
    },
    open,
    save,
    {
      setupRequest: (req, c) => {
        start(c, 'comments');
        return { ...req, method: 'GET', path: `/api/designs/${designOf(c)}/comments`, headers: h(c) };
      },
      onResponse: (status, _b, c) => done(status, c),
    },
    {
      setupRequest: (req, c) => {
        start(c, 'comment');
        return {
          ...req,
          method: 'POST',
          path: `/api/designs/${designOf(c)}/comments`,
          headers: h(c, json),
          body: JSON.stringify({ revision: 1, body: 'Load check: is C3 derated for the full output?', anchor: { kind: 'design' } }),
        };
      },
      onResponse: (status, _b, c) => done(status, c),
    },
    open,
    save,
  ];
  if (solve) {
    list.push({
      setupRequest: (req, c) => {
        start(c, 'solve');
        // what did the last save change: the design's latest revision against the one before (new
        // documents, so the server solves for real; answers are reused only for revisions seen before)
        const b = Math.max(2, c.base ?? 2);
        return { ...req, method: 'GET', path: `/designs/${designOf(c)}/compare?a=${b - 1}&b=${b}`, headers: h(c) };
      },
      onResponse: (status, _b, c) => done(status, c),
    });
  }
  // Paced clients begin at different steps of the session (client i at the i-th step that needs
  // nothing from an earlier one, i.e. not at a save), so that at any second the 50 clients are
  // spread over the session as a real team is, rather than all listing, or all comparing, in the
  // same second. (In step, every compare of the phase arrives in one second and every answer
  // after it lands in one burst: p95 of the following request was 0.4–0.5 s for that reason alone.)
  const entries = list.map((r, i) => (r === save ? -1 : i)).filter((i) => i >= 0);
  const at = entries[client % entries.length];
  return [...list.slice(at), ...list.slice(0, at)];
}

async function phase(fx: Fixture, connections: number, solve: boolean, label: string): Promise<void> {
  resetStats();
  const options = { url: BASE, pipelining: 1, duration: DURATION_S, timeout: TIMEOUT_S };
  let result: AcResult;
  if (RATE > 0) {
    // paced clients: one autocannon instance per client, their starts spread over one pacing
    // interval, so the clients do not all ask in the same millisecond (autocannon paces every
    // connection of one instance in step, which turns a steady load into bursts)
    const gapMs = 1000 / RATE / connections;
    const runs = await Promise.all(
      Array.from({ length: connections }, (_, i) =>
        new Promise<AcResult>((resolve, reject) =>
          setTimeout(() => autocannon({ ...options, connections: 1, connectionRate: RATE, requests: requests(fx, solve, i) }).then(resolve, reject), i * gapMs),
        ),
      ),
    );
    const sum = (f: (r: AcResult) => number) => runs.reduce((n, r) => n + f(r), 0);
    result = {
      ...runs[0],
      requests: { ...runs[0].requests, total: sum((r) => r.requests.total), sent: sum((r) => r.requests.sent) },
      errors: sum((r) => r.errors),
      timeouts: sum((r) => r.timeouts),
      non2xx: sum((r) => r.non2xx),
      '2xx': sum((r) => r['2xx']),
      duration: Math.max(...runs.map((r) => r.duration)) + (connections - 1) * gapMs / 1000,
    };
  } else {
    result = await autocannon({
      ...options,
      connections,
      maxOverallRequests: AMOUNT, // (autocannon ignores duration when given `amount`)
      requests: requests(fx, solve),
    });
  }
  const seconds = result.duration;
  console.log(`\n[load] machine: ${os.cpus().length} cores, load average ${os.loadavg().map((l) => l.toFixed(1)).join(' / ')} (1/5/15 min) after the phase`);
  console.log(`[load] ${label}: ${connections} clients${RATE > 0 ? ` at ${RATE} request/s each` : ' back to back'}, ${seconds.toFixed(1)} s, ${result.requests.total} requests, ${(result.requests.total / seconds).toFixed(1)} req/s; non-2xx ${result.non2xx} (409 on save ${saved409Phase()}), socket errors ${result.errors}, timeouts ${result.timeouts}`);
  console.log('kind       n      p50 ms   p95 ms   p99 ms   answers');
  for (const k of KINDS) {
    const s = stats[k];
    if (s.ms.length === 0) continue;
    const sorted = [...s.ms].sort((a, b) => a - b);
    const answers = [...s.status.entries()].sort((a, b) => a[0] - b[0]).map(([st, n]) => `${st}×${n}`).join(' ');
    console.log(`${k.padEnd(9)} ${String(s.ms.length).padStart(6)} ${pct(sorted, 50).toFixed(1).padStart(8)} ${pct(sorted, 95).toFixed(1).padStart(8)} ${pct(sorted, 99).toFixed(1).padStart(8)}   ${answers}`);
  }
}
let last409 = 0;
function saved409Phase(): number {
  const n = saved409 - last409;
  last409 = saved409;
  return n;
}

async function main(): Promise<void> {
  if (!EXTERNAL_URL) await startServer();
  else await waitHealthy(10_000);
  try {
    const fx = await setup();
    resetStats();
    // the warm-up takes every path the phases take (the compare page's code loads on its first use)
    await autocannon({ url: BASE, connections: 5, pipelining: 1, duration: 3, requests: requests(fx, MIXES.includes('full')), timeout: TIMEOUT_S });
    console.log('[load] warm-up: 5 clients for 3 s (not reported)');
    saved409Phase();
    for (const mix of MIXES) for (const n of CLIENTS) await phase(fx, n, mix === 'full', `${mix === 'full' ? 'full mix (with compare solves)' : 'mix without solves'}`);
    // saves still in flight when the last phase stopped may commit now: let them land, then read
    // the revisions and the counters in one transaction (one snapshot), so the two agree
    await new Promise((r) => setTimeout(r, 2000));
    const { stored, latest } = await db().sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ }, async (transaction) => {
      const [rows] = (await db().sequelize.query("SELECT message FROM design_revisions WHERE design_id IN (:ids) AND message LIKE 'load save %'", { replacements: { ids: fx.designIds }, transaction })) as [{ message: string }[], unknown];
      const [[counters]] = (await db().sequelize.query('SELECT sum(latest_revision - 2)::int AS n FROM designs WHERE id IN (:ids)', { replacements: { ids: fx.designIds }, transaction })) as [[{ n: number }], unknown];
      return { stored: rows, latest: counters };
    });
    const storedSet = new Set(stored.map((r) => r.message));
    const missing = [...savedMessages].filter((m) => !storedSet.has(m));
    const unanswered = stored.length - savedMessages.size + missing.length;
    // autocannon closes its sockets when a phase ends: a save in flight then may still commit on the
    // server although no client read its 201; those are counted apart, never as "believed saved"
    const maxInFlight = Math.max(...CLIENTS) * (CLIENTS.length * MIXES.length + 1);
    console.log(
      `\n[load] saves answered 201: ${saved201}; of them missing in the database: ${missing.length}; revisions stored: ${stored.length} ` +
        `(latest-revision counters: ${latest.n}); stored without an answer read (in flight when a phase stopped): ${unanswered}`,
    );
    const ok = missing.length === 0 && latest.n === stored.length && unanswered >= 0 && unanswered <= maxInFlight;
    console.log(`[load] every save answered 201 is stored: ${missing.length === 0 ? 'yes' : 'NO'}; counters agree: ${latest.n === stored.length ? 'yes' : 'NO'}`);
    if (!ok) process.exitCode = 1;
  } finally {
    if (server) server.kill('SIGTERM');
    await closeDb();
  }
}

main().catch((e: unknown) => {
  console.error(e);
  if (server) server.kill('SIGTERM');
  process.exit(1);
});
