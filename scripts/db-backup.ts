/**
 * `npm run db:backup [-- FILE]`: a custom-format dump (`pg_dump -Fc --no-owner --no-privileges`)
 * of DATABASE_URL (default as in scripts/env.sh) written to FILE, or to
 * `.data/backups/kilorung-<UTC timestamp>.dump`. Prints the path, the size and how many designs and
 * revisions it holds.
 *
 * The counts are taken in the very snapshot pg_dump dumps: this script opens a REPEATABLE READ
 * transaction, exports its snapshot, counts, and hands the snapshot to `pg_dump --snapshot`,
 * keeping the transaction open until the dump is done. The dump is written to `FILE.partial` and
 * renamed when pg_dump succeeds, so a failed backup leaves no file that looks whole. The file is
 * made readable by its owner only: it holds every account's password hash.
 *
 * Exit codes: 0 written; 1 the database is unreachable or pg_dump failed; 2 usage.
 */
import fs from 'node:fs';
import path from 'node:path';
import { census, connect, dataDir, describeCensus, formatBytes, runPg, runScript, ScriptError, target } from './db-backup-lib';

const USAGE = 'usage: npm run db:backup [-- FILE]';

/** 2026-12-02T16:21:27.123Z → 20261202T162127Z */
const stamp = (d: Date) => d.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');

await runScript('db:backup', async () => {
  const args = process.argv.slice(2);
  const options = args.filter((a) => a.startsWith('-'));
  if (options.length) throw new ScriptError(`unknown option ${options[0]}; ${USAGE}`, 2);
  if (args.length > 1) throw new ScriptError(USAGE, 2);
  const t = target();
  const file = path.resolve(args[0] ?? path.join(dataDir(), 'backups', `kilorung-${stamp(new Date())}.dump`));
  if (fs.existsSync(file)) throw new ScriptError(`${file} already exists; a backup never overwrites a file`, 2);
  fs.mkdirSync(path.dirname(file), { recursive: true, mode: 0o700 });
  const partial = `${file}.partial`;

  const t0 = performance.now();
  const client = await connect(t);
  let counted;
  try {
    await client.query('BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY');
    const { rows } = await client.query<{ snapshot: string }>('SELECT pg_export_snapshot() AS snapshot');
    counted = await census(client);
    try {
      await runPg('pg_dump', ['--format=custom', '--no-owner', '--no-privileges', `--snapshot=${rows[0].snapshot}`, `--file=${partial}`, `--dbname=${t.url}`], t);
    } catch (e) {
      fs.rmSync(partial, { force: true });
      throw e;
    }
    await client.query('COMMIT');
  } finally {
    await client.end().catch(() => undefined);
  }
  fs.chmodSync(partial, 0o600);
  fs.renameSync(partial, file);
  const seconds = (performance.now() - t0) / 1000;
  const size = fs.statSync(file).size;
  console.log(`db:backup: wrote ${file}`);
  console.log(`db:backup: ${formatBytes(size)} (${size} bytes) from ${t.display} in ${seconds.toFixed(2)} s`);
  console.log(`db:backup: holds ${describeCensus(counted)} (counted in the snapshot pg_dump dumped)`);
});
