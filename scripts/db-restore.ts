/**
 * `npm run db:restore -- FILE [--yes]`: put a `db:backup` dump back into DATABASE_URL (default as
 * in scripts/env.sh) with `pg_restore --clean --if-exists --no-owner --no-privileges
 * --single-transaction`: every object in the dump is dropped and re-created in one transaction,
 * so a restore that fails part-way leaves the database exactly as it was.
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
import path from 'node:path';
import { census, connect, describeCensus, runPg, runScript, ScriptError, target, type Target } from './db-backup-lib';

const USAGE = 'usage: npm run db:restore -- FILE [--yes]';

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
  try {
    await runPg('pg_restore', ['--clean', '--if-exists', '--no-owner', '--no-privileges', '--single-transaction', `--dbname=${t.url}`, file], t);
  } catch (e) {
    throw new ScriptError(`${e instanceof Error ? e.message : String(e)}\nthe restore ran in one transaction and was rolled back: ${t.display} is as it was`);
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
