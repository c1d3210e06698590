/**
 * What `db:backup` and `db:restore` share: where the database is (DATABASE_URL, defaulting like
 * scripts/env.sh), how Debian's PostgreSQL 15 client programs are run (execFile with argument
 * arrays, the password passed in PGPASSWORD and never on a command line or in a message), and a
 * census of the rows a backup holds or a restore would replace.
 */
import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';

/** Debian's PostgreSQL 15 programs, the same ones scripts/pg-up.sh and scripts/test.sh use. */
export const PG_BIN = process.env.PG_BIN ?? '/usr/lib/postgresql/15/bin';

export const ROOT = path.resolve(import.meta.dirname, '..');

/** KR_DATA as scripts/env.sh sets it. */
export const dataDir = () => process.env.KR_DATA || path.join(ROOT, '.data');

/** A script failure: the message is printed on stderr and the process exits with `code`. */
export class ScriptError extends Error {
  constructor(
    message: string,
    readonly code = 1,
  ) {
    super(message);
  }
}

export interface Target {
  /** The URL without its password, for --dbname and pg.Client. */
  url: string;
  /** user@host:port/db, for messages. */
  display: string;
  /** The password from the URL, if any (given to children as PGPASSWORD, never printed). */
  password?: string;
  /** DATABASE_URL as given, password included: only for in-process clients, never printed or passed to a child. */
  fullUrl: string;
}

/** DATABASE_URL, or the default scripts/env.sh would export. */
export function target(): Target {
  const raw = process.env.DATABASE_URL || `postgres://app@127.0.0.1:${process.env.PGPORT || '54329'}/${process.env.KR_DB || 'kilorung'}`;
  let u: URL;
  try {
    u = new URL(raw);
  } catch {
    throw new ScriptError('DATABASE_URL is not a valid postgres:// URL', 2);
  }
  if (u.protocol !== 'postgres:' && u.protocol !== 'postgresql:') throw new ScriptError('DATABASE_URL must be a postgres:// URL', 2);
  const password = u.password ? decodeURIComponent(u.password) : undefined;
  u.password = '';
  const user = u.username ? `${decodeURIComponent(u.username)}@` : '';
  return { url: u.toString(), display: `${user}${u.host}${u.pathname}`, password, fullUrl: raw };
}

/** Replace the password (raw and URL-encoded) wherever it might appear in a child's message. */
export function redact(text: string, t: Target): string {
  if (!t.password) return text;
  let out = text;
  for (const p of new Set([t.password, encodeURIComponent(t.password)])) out = out.split(p).join('***');
  return out;
}

/** Run one of Debian's PostgreSQL programs; rejects with its stderr (redacted) on a non-zero exit. */
export function runPg(program: string, args: string[], t: Target, extraEnv: Record<string, string> = {}): Promise<{ stdout: string; stderr: string }> {
  const bin = path.join(PG_BIN, program);
  if (!fs.existsSync(bin)) {
    return Promise.reject(new ScriptError(`${bin} not found: install Debian's PostgreSQL 15 client (bash scripts/pg-up.sh does) or set PG_BIN`, 2));
  }
  const env: NodeJS.ProcessEnv = { ...process.env, PGCONNECT_TIMEOUT: process.env.PGCONNECT_TIMEOUT ?? '10', ...extraEnv };
  if (t.password) env.PGPASSWORD = t.password;
  return new Promise((resolve, reject) => {
    execFile(bin, args, { env, encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 }, (error, stdout, stderr) => {
      if (error) {
        const detail = redact((stderr || error.message).trim(), t);
        reject(new ScriptError(`${program} failed: ${detail}`));
      } else {
        resolve({ stdout, stderr: redact(stderr, t) });
      }
    });
  });
}

/** Open a client on the target, turning a connection failure into a readable message. */
export async function connect(t: Target): Promise<pg.Client> {
  const client = new pg.Client({ connectionString: t.url, password: t.password, connectionTimeoutMillis: 10_000 });
  try {
    await client.connect();
  } catch (e) {
    await client.end().catch(() => undefined);
    throw new ScriptError(`cannot reach the database ${t.display}: ${redact(e instanceof Error ? e.message : String(e), t)}`);
  }
  return client;
}

/** Tables whose counts are reported, in this order, with their printed names. */
const REPORTED: [table: string, label: string][] = [
  ['designs', 'designs'],
  ['design_revisions', 'revisions'],
  ['approvals', 'approvals'],
  ['comments', 'comments'],
  ['users', 'users'],
  ['teams', 'teams'],
];

export interface Census {
  /** Row counts of the reported tables that exist (a missing table is absent). */
  counts: Record<string, number>;
  /** Tables in the public schema (other than the migration log) that hold at least one row. */
  nonEmpty: string[];
}

const quoteIdent = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** Count what the public schema holds, in the client's current transaction if one is open. */
export async function census(client: pg.Client): Promise<Census> {
  const { rows: tables } = await client.query<{ name: string }>(
    `SELECT tablename AS name FROM pg_tables WHERE schemaname = 'public' AND tablename <> 'SequelizeMeta' ORDER BY tablename`,
  );
  const counts: Record<string, number> = {};
  const nonEmpty: string[] = [];
  const names = new Set(tables.map((r) => r.name));
  for (const { name } of tables) {
    if (REPORTED.some(([table]) => table === name)) {
      const { rows } = await client.query<{ n: string }>(`SELECT count(*) AS n FROM public.${quoteIdent(name)}`);
      counts[name] = Number(rows[0].n);
      if (counts[name] > 0) nonEmpty.push(name);
    } else {
      const { rows } = await client.query<{ any: boolean }>(`SELECT EXISTS (SELECT 1 FROM public.${quoteIdent(name)}) AS any`);
      if (rows[0].any) nonEmpty.push(name);
    }
  }
  for (const [table] of REPORTED) if (!names.has(table)) delete counts[table];
  return { counts, nonEmpty };
}

/** "4 designs, 10 revisions, 1 approvals, …" — or "no Kilorung tables" for an empty schema. */
export function describeCensus(c: Census): string {
  const parts = REPORTED.filter(([table]) => table in c.counts).map(([table, label]) => `${c.counts[table]} ${label}`);
  const others = c.nonEmpty.filter((t) => !REPORTED.some(([table]) => table === t)).length;
  if (!parts.length) return c.nonEmpty.length ? `${c.nonEmpty.length} table(s) with rows` : 'no Kilorung tables';
  return parts.join(', ') + (others ? `, and rows in ${others} other table(s)` : '');
}

/** 1536 → "1.5 KiB". */
export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  const units = ['KiB', 'MiB', 'GiB'];
  let v = n / 1024;
  let i = 0;
  while (v >= 1024 && i < units.length - 1) {
    v /= 1024;
    i += 1;
  }
  return `${v.toFixed(1)} ${units[i]}`;
}

/** Run `main`, printing a ScriptError (or any error) as `<name>: message` and exiting non-zero. */
export async function runScript(name: string, main: () => Promise<void>): Promise<void> {
  try {
    await main();
  } catch (e) {
    const code = e instanceof ScriptError ? e.code : 1;
    process.stderr.write(`${name}: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = code;
  }
}
