/**
 * `npm run db:restore -- FILE [--yes]`: put a `db:backup` dump back into DATABASE_URL (default as
 * in scripts/env.sh): `pg_restore --clean --if-exists --no-owner --no-privileges` writes the
 * dump as SQL (to a private temporary file), and psql runs it with ON_ERROR_STOP in one
 * transaction (`--single-transaction`), so a restore that fails part-way leaves the database
 * exactly as it was. Schemas the dump holds besides public (the job queue's `pgboss`, whose
 * partitioned tables `--clean` cannot take apart constraint by constraint) are dropped whole with
 * CASCADE first, in the same transaction; public objects are dropped one by one as the dump
 * lists them, so an object someone added on top of a table (a view, say) stops the restore.
 *
 * Refuses when FILE is missing or is not a PostgreSQL custom-format dump (checked with
 * `pg_restore --list` before anything is touched), and refuses to replace a database that holds
 * rows unless `--yes` is given (it prints what would be replaced). Prints the counts afterwards
 * and says when this code has migrations newer than the dump.
 *
 * Exit codes: 0 restored; 1 the database is unreachable or pg_restore failed (nothing changed);
 * 2 usage, or FILE is missing or not a dump; 3 the database holds data and --yes was not given.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { census, connect, describeCensus, runPg, runScript, ScriptError, target, type Target } from './db-backup-lib';

const USAGE = 'usage: npm run db:restore -- FILE [--yes]';

const quoteIdent = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** The schemas a dump creates, from its `pg_restore --list` table of contents. */
function dumpSchemas(listing: string): string[] {
  return [...listing.matchAll(/^\d+; \d+ \d+ SCHEMA - (\S+) /gm)].map((m) => m[1]);
}

/** Migrations this code has that the restored database has not run. */
async function pendingMigrations(t: Target): Promise<string[]> {
  // imported here, not at the top: the refusals answer without loading Sequelize
  const [{ createSequelize }, { createMigrator }] = await Promise.all([import('../lib/db'), import('../migrations/migrator')]);
  const sequelize = createSequelize(t.fullUrl, 1);
  try {
    return (await createMigrator(sequelize, true).pending()).map((m) => m.name);
  } finally {
    await sequelize.close();
  }
}

await runScript('db:restore', async () => {
  const args = process.argv.slice(2);
  const yes = args.includes('--yes');
  const unknown = args.filter((a) => a.startsWith('-') && a !== '--yes');
  if (unknown.length) throw new ScriptError(`unknown option ${unknown[0]}; ${USAGE}`, 2);
  const files = args.filter((a) => !a.startsWith('-'));
  if (files.length !== 1) throw new ScriptError(`${files.length ? 'one FILE only' : 'no FILE given'}; ${USAGE}`, 2);
  const file = path.resolve(files[0]);
  let stat: fs.Stats;
  try {
    stat = fs.statSync(file);
  } catch {
    throw new ScriptError(`${file} does not exist`, 2);
  }
  if (!stat.isFile()) throw new ScriptError(`${file} is not a file`, 2);

  const t = target();
  let listing: string;
  try {
    listing = (await runPg('pg_restore', ['--list', file], t)).stdout;
  } catch (e) {
    if (e instanceof ScriptError && e.code === 2) throw e;
    throw new ScriptError(`${file} is not a PostgreSQL custom-format dump (${e instanceof Error ? e.message : String(e)}); nothing was changed`, 2);
  }
  const from = /^;\s+dbname: (.*)$/m.exec(listing)?.[1]?.trim();
  const at = /^;\s+Archive created at (.*)$/m.exec(listing)?.[1]?.trim();

  const client = await connect(t);
  let before;
  try {
    before = await census(client);
  } finally {
    await client.end().catch(() => undefined);
  }
  console.log(`db:restore: ${file}${from ? ` (a dump of ${from}${at ? ` taken ${at}` : ''})` : ''} → ${t.display}`);
  if (before.nonEmpty.length) {
    if (!yes) {
      throw new ScriptError(`${t.display} holds data that the restore would replace: ${describeCensus(before)}. Run again with --yes to replace it (npm run db:restore -- FILE --yes)`, 3);
    }
    console.log(`db:restore: replacing ${describeCensus(before)}`);
  }

  const t0 = performance.now();
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'kilorung-restore-'));
  try {
    const sql = path.join(work, 'restore.sql');
    await runPg('pg_restore', ['--clean', '--if-exists', '--no-owner', '--no-privileges', `--file=${sql}`, file], t);
    fs.chmodSync(sql, 0o600);
    const prelude = dumpSchemas(listing)
      .filter((name) => name !== 'public')
      .map((name) => `DROP SCHEMA IF EXISTS ${quoteIdent(name)} CASCADE;`)
      .join(' ');
    const args = ['-X', '-q', '-v', 'ON_ERROR_STOP=1', '--single-transaction', `--dbname=${t.url}`];
    if (prelude) args.push('-c', prelude);
    args.push('-f', sql);
    await runPg('psql', args, t, { PGOPTIONS: '-c client_min_messages=warning' });
  } catch (e) {
    throw new ScriptError(`${e instanceof Error ? e.message : String(e)}\nthe restore ran in one transaction and was rolled back: ${t.display} is as it was`);
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }
  const seconds = (performance.now() - t0) / 1000;

  const after = await connect(t);
  try {
    console.log(`db:restore: restored in ${seconds.toFixed(2)} s; ${t.display} now holds ${describeCensus(await census(after))}`);
  } finally {
    await after.end().catch(() => undefined);
  }
  const pending = await pendingMigrations(t);
  if (pending.length) console.log(`db:restore: the dump predates ${pending.length} migration(s) of this code (${pending.join(', ')}): run npm run db:migrate`);
});
