/**
 * The one Sequelize instance of the process, created on first use (never at import time, so
 * `next build` needs no database) and kept on globalThis so dev-mode module reloads do not open
 * a new pool each time.
 *
 * No `import 'server-only'` here or in models/: the migrate and seed scripts run under tsx,
 * where that marker package throws. The server-only boundary is lib/data and lib/auth, which
 * are the only modules pages and routes import.
 */
import pg from 'pg';
import { Sequelize } from 'sequelize';
import { env } from './env';
import { initModels, type Models } from '../models';

interface Db {
  sequelize: Sequelize;
  models: Models;
}

const holder = globalThis as typeof globalThis & { __kilorungDb?: Db };

/**
 * Open a Sequelize instance on `url`. The pool is bounded (DB_POOL_MAX, default 20): a few
 * hundred concurrent HTTP clients share these connections, and PostgreSQL here allows 200 in
 * total for every process together.
 */
export function createSequelize(url: string, poolMax: number): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: poolMax, min: 0, idle: 10_000, acquire: 30_000, evict: 5_000 },
    define: { underscored: true },
  });
}

/** The process's database handle: the Sequelize instance and its initialised models. */
export function db(): Db {
  if (!holder.__kilorungDb) {
    const e = env();
    const sequelize = createSequelize(e.DATABASE_URL, e.DB_POOL_MAX);
    holder.__kilorungDb = { sequelize, models: initModels(sequelize) };
  }
  return holder.__kilorungDb;
}

/** Close the pool (scripts and tests call this when done). */
export async function closeDb(): Promise<void> {
  const current = holder.__kilorungDb;
  holder.__kilorungDb = undefined;
  if (current) await current.sequelize.close();
}
