/**
 * `npm run db:backup` / `npm run db:restore`: the demo data backed up, the schema wiped, the dump
 * restored, and every design revision found again with the same document; the refusals (no file,
 * not a dump, data present without --yes) and a failed restore leave the database as it was.
 * The scripts run as child processes under tsx against DATABASE_URL (a *_test database).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { db } from '@/lib/db';
import { createMigrator } from '@/migrations/migrator';
import { createBoss, ensureQueue, sendAnalysisJob } from '@/lib/jobs/boss';
import { resetDatabase, teardown } from './helpers';

const root = path.resolve(import.meta.dirname, '../..');
const tsx = path.join(root, 'node_modules/tsx/dist/cli.mjs');

function run(script: string, args: string[] = [], env: Record<string, string> = {}) {
  const r = spawnSync(process.execPath, [tsx, script, ...args], { cwd: root, env: { ...process.env, ...env }, encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}
const backup = (args: string[] = [], env: Record<string, string> = {}) => run('scripts/db-backup.ts', args, env);
const restore = (args: string[] = [], env: Record<string, string> = {}) => run('scripts/db-restore.ts', args, env);

const q = <T extends object>(sql: string) => db().sequelize.query<T>(sql, { type: QueryTypes.SELECT });

/** Everything the restore must bring back, read straight from the tables. */
async function state() {
  const revisions = await q<{ design_id: string; number: number; hash: string; author_id: string; message: string; created_at: string }>(
    `SELECT design_id, number, md5(document::text) AS hash, author_id, message, created_at::text
       FROM design_revisions ORDER BY design_id, number`,
  );
  const [tables] = await q<Record<string, string>>(
    `SELECT (SELECT count(*) FROM designs) AS designs,
            (SELECT count(*) FROM approvals) AS approvals, (SELECT md5(string_agg(a::text, '|' ORDER BY a.id)) FROM approvals a) AS approvals_hash,
            (SELECT count(*) FROM comments) AS comments, (SELECT md5(string_agg(c::text, '|' ORDER BY c.id)) FROM comments c) AS comments_hash,
            (SELECT count(*) FROM users) AS users, (SELECT count(*) FROM teams) AS teams,
            (SELECT md5(string_agg(d::text, '|' ORDER BY d.id)) FROM designs d) AS designs_hash,
            (SELECT string_agg(j.id::text || ':' || j.state, '|' ORDER BY j.id) FROM pgboss.job j) AS queued_jobs`,
  );
  return { revisions, tables };
}

const wipe = () => db().sequelize.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');

let dir: string;
let dump: string;
let demo: Awaited<ReturnType<typeof state>>;

/** The job queue's own schema (pg-boss: partitioned tables) with one queued job, as the worker leaves it. */
async function queueOneJob(): Promise<void> {
  const boss = createBoss(process.env.DATABASE_URL!, { role: 'web', max: 1 });
  await boss.start();
  try {
    await ensureQueue(boss);
    await sendAnalysisJob(boss, '5ca1ab1e-0000-4000-8000-00000000b0c5');
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
}

beforeAll(async () => {
  await db().sequelize.query('DROP SCHEMA IF EXISTS pgboss CASCADE');
  await resetDatabase();
  const seeded = run('scripts/seed.ts');
  if (seeded.status !== 0) throw new Error(`seed failed: ${seeded.stderr}`);
  await queueOneJob();
  demo = await state();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kilorung-backup-'));
  dump = path.join(dir, 'demo.dump');
});
afterAll(async () => {
  fs.rmSync(dir, { recursive: true, force: true });
  await teardown();
});

describe('db:backup and db:restore', () => {
  it('backs up the demo data and the job queue, and after a wipe the restore brings back every revision with the same document', async () => {
    expect(demo.revisions.length).toBeGreaterThanOrEqual(8);
    expect(demo.tables.queued_jobs).toBe('5ca1ab1e-0000-4000-8000-00000000b0c5:created');
    expect(Number(demo.tables.approvals)).toBeGreaterThan(0);
    expect(Number(demo.tables.comments)).toBeGreaterThan(0);

    const b = backup([dump]);
    expect(b.stderr).toBe('');
    expect(b.status).toBe(0);
    expect(b.stdout).toContain(dump);
    expect(b.stdout).toContain(`${demo.tables.designs} designs, ${demo.revisions.length} revisions, ${demo.tables.approvals} approvals, ${demo.tables.comments} comments`);
    expect(b.stdout).toContain(`(${fs.statSync(dump).size} bytes)`);
    expect(fs.readFileSync(dump).subarray(0, 5).toString()).toBe('PGDMP');
    expect(fs.statSync(dump).mode & 0o077).toBe(0);
    expect(fs.existsSync(`${dump}.partial`)).toBe(false);
    // never overwrites
    const again = backup([dump]);
    expect(again.status).toBe(2);
    expect(again.stderr).toMatch(/already exists/);

    await wipe();
    expect(await q(`SELECT to_regclass('public.design_revisions') AS t`)).toEqual([{ t: null }]);

    const r = restore([dump, '--yes']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(`now holds ${demo.tables.designs} designs, ${demo.revisions.length} revisions`);
    expect(r.stdout).toMatch(new RegExp(`a dump of ${new URL(process.env.DATABASE_URL!).pathname.slice(1)} taken \\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d:\\d\\d UTC`));
    expect(r.stdout).not.toMatch(/replacing|predates/);

    expect(await state()).toEqual(demo);
    // the restored schema still guards its history
    await expect(db().sequelize.query(`UPDATE design_revisions SET message = 'rewritten' WHERE number = 1`)).rejects.toThrow(/never updated in place/);
    await expect(db().sequelize.query('DELETE FROM approvals')).rejects.toThrow();
    expect(await createMigrator(db().sequelize, true).pending()).toEqual([]);
    expect(await state()).toEqual(demo);
  });

  it('refuses without FILE, with a missing file or a file that is not a dump, and changes nothing', async () => {
    const none = restore(['--yes']);
    expect(none.status).toBe(2);
    expect(none.stderr).toMatch(/no FILE given; usage/);

    const missing = restore([path.join(dir, 'absent.dump'), '--yes']);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/absent\.dump does not exist/);

    const text = path.join(dir, 'notes.dump');
    fs.writeFileSync(text, 'DROP SCHEMA public CASCADE;\n'.repeat(20));
    const notDump = restore([text, '--yes']);
    expect(notDump.status).toBe(2);
    expect(notDump.stderr).toMatch(/is not a PostgreSQL custom-format dump .*nothing was changed/);

    const truncated = path.join(dir, 'truncated.dump');
    fs.writeFileSync(truncated, fs.readFileSync(dump).subarray(0, 4096));
    const cut = restore([truncated, '--yes']);
    expect(cut.status).toBe(2);
    expect(cut.stderr).toMatch(/not a PostgreSQL custom-format dump/);

    expect(await state()).toEqual(demo);
  });

  it('refuses to replace a database that holds data unless --yes is given, and says what it holds', async () => {
    const r = restore([dump]);
    expect(r.status).toBe(3);
    expect(r.stderr).toContain(`holds data that the restore would replace: ${demo.tables.designs} designs, ${demo.revisions.length} revisions`);
    expect(r.stderr).toMatch(/--yes/);
    expect(await state()).toEqual(demo);
  });

  it('a restore that fails part-way is rolled back: the database is as it was, newer rows included', async () => {
    const teamId = '0ddba11a-0000-4000-8000-000000000001';
    await db().sequelize.query(`INSERT INTO teams (id, name, created_at, updated_at) VALUES ('${teamId}', 'Added after the backup', now(), now())`);
    // a view on designs: pg_restore --clean cannot drop designs, so the restore fails midway
    await db().sequelize.query('CREATE VIEW design_titles AS SELECT id, title FROM designs');
    const before = await state();

    const r = restore([dump, '--yes']);
    expect(r.status).toBe(1);
    expect(r.stdout).toMatch(/replacing/);
    expect(r.stderr).toMatch(/(pg_restore|psql) failed: .*design_titles/s);
    expect(r.stderr).toMatch(/rolled back: .* is as it was/);

    expect(await state()).toEqual(before);
    expect(await q(`SELECT name FROM teams WHERE id = '${teamId}'`)).toEqual([{ name: 'Added after the backup' }]);
    expect(await q('SELECT count(*)::int AS n FROM design_titles')).toEqual([{ n: Number(demo.tables.designs) }]);

    await db().sequelize.query('DROP VIEW design_titles');
    const ok = restore([dump, '--yes']);
    expect(ok.status).toBe(0);
    expect(await state()).toEqual(demo);
  });

  it('says when the restored dump predates migrations this code has', async () => {
    const [last] = await q<{ name: string }>(`SELECT name FROM "SequelizeMeta" ORDER BY name DESC LIMIT 1`);
    await db().sequelize.query(`DELETE FROM "SequelizeMeta" WHERE name = '${last.name}'`);
    const older = path.join(dir, 'older.dump');
    expect(backup([older]).status).toBe(0);
    const r = restore([older, '--yes']);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(`the dump predates 1 migration(s) of this code (${last.name}): run npm run db:migrate`);
    expect(restore([dump, '--yes']).status).toBe(0);
    expect(await createMigrator(db().sequelize, true).pending()).toEqual([]);
  });

  it('never prints the password from DATABASE_URL, and fails clearly when the database is unreachable or pg_dump fails', async () => {
    const secret = 'pw-N0t-For-Logs';
    const url = new URL(process.env.DATABASE_URL!);
    url.password = secret; // the local server trusts loopback, so the password is ignored by it
    const withPassword = backup([path.join(dir, 'with-password.dump')], { DATABASE_URL: url.toString() });
    expect(withPassword.status).toBe(0);
    expect(withPassword.stdout + withPassword.stderr).not.toContain(secret);

    const unreachable = new URL(url);
    unreachable.port = '1';
    const down = backup([path.join(dir, 'down.dump')], { DATABASE_URL: unreachable.toString() });
    expect(down.status).toBe(1);
    expect(down.stderr).toMatch(/cannot reach the database .*127\.0\.0\.1:1\//);
    expect(down.stdout + down.stderr).not.toContain(secret);
    expect(fs.existsSync(path.join(dir, 'down.dump'))).toBe(false);

    // a pg_dump that writes part of a file and fails: no file is left that looks like a backup
    const fakeBin = path.join(dir, 'bin');
    fs.mkdirSync(fakeBin);
    fs.writeFileSync(
      path.join(fakeBin, 'pg_dump'),
      `#!/bin/sh\nfor a in "$@"; do case "$a" in --file=*) printf PGDMP > "\${a#--file=}";; esac; done\necho "pg_dump: error: query failed: server closed the connection; password was $PGPASSWORD" >&2\nexit 1\n`,
      { mode: 0o755 },
    );
    const failed = backup([path.join(dir, 'failed.dump')], { DATABASE_URL: url.toString(), PG_BIN: fakeBin });
    expect(failed.status).toBe(1);
    expect(failed.stderr).toMatch(/pg_dump failed: pg_dump: error: query failed/);
    expect(failed.stderr).not.toContain(secret);
    expect(fs.readdirSync(dir).filter((f) => f.startsWith('failed'))).toEqual([]);

    expect(await state()).toEqual(demo);
  });
});
