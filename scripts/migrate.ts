/**
 * Database migrations: `tsx scripts/migrate.ts up | down | pending | reset`.
 * up: apply all pending · down: undo the last one (`down all` undoes every one) ·
 * pending: list what up would run · reset: undo all, then apply all.
 */
import { createSequelize } from '../lib/db';
import { createMigrator } from '../migrations/migrator';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set (source scripts/env.sh)');
  process.exit(2);
}
const [command = 'up', arg] = process.argv.slice(2);
const sequelize = createSequelize(url, 2);
const migrator = createMigrator(sequelize);
try {
  if (command === 'up') {
    const done = await migrator.up();
    console.log(done.length ? `applied ${done.length} migration(s)` : 'database is up to date');
  } else if (command === 'down') {
    const undone = await migrator.down(arg === 'all' ? { to: 0 } : undefined);
    console.log(`reverted ${undone.length} migration(s)`);
  } else if (command === 'pending') {
    const pending = await migrator.pending();
    console.log(pending.length ? pending.map((m) => m.name).join('\n') : 'nothing pending');
  } else if (command === 'reset') {
    await migrator.down({ to: 0 });
    const done = await migrator.up();
    console.log(`re-applied ${done.length} migration(s)`);
  } else {
    console.error(`unknown command "${command}"; use up | down [all] | pending | reset`);
    process.exitCode = 2;
  }
} catch (e) {
  console.error('migration failed:', e instanceof Error ? e.message : e);
  process.exitCode = 1;
} finally {
  await sequelize.close();
}
