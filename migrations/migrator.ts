/**
 * The umzug migrator. Migrations are listed here by import rather than found by a glob, so the
 * same list works under tsx (scripts/migrate.ts), vitest (route tests) and any bundler; add a
 * new migration file to MIGRATIONS in name order.
 */
import type { QueryInterface, Sequelize } from 'sequelize';
import { Umzug, SequelizeStorage } from 'umzug';
import * as createUsersAndAuth from './20261202000100-create-users-and-auth';
import * as createTeams from './20261202000200-create-teams';
import * as createDesigns from './20261202000300-create-designs';
import * as reviewsAndOffers from './20261202000400-reviews-and-offers';
import * as commentsAndActivity from './20261202000500-comments-and-activity';
import * as partsLibrary from './20261202000600-parts-library';
import * as benchData from './20261202000700-bench-data';
import * as analyses from './20261202000800-analyses';
import * as auditLog from './20261202000900-audit-log';

type Step = (params: { context: QueryInterface }) => Promise<void>;
const MIGRATIONS: [string, { up: Step; down: Step }][] = [
  ['20261202000100-create-users-and-auth', createUsersAndAuth],
  ['20261202000200-create-teams', createTeams],
  ['20261202000300-create-designs', createDesigns],
  ['20261202000400-reviews-and-offers', reviewsAndOffers],
  ['20261202000500-comments-and-activity', commentsAndActivity],
  ['20261202000600-parts-library', partsLibrary],
  ['20261202000700-bench-data', benchData],
  ['20261202000800-analyses', analyses],
  ['20261202000900-audit-log', auditLog],
];

/** A migrator over `sequelize`; `quiet` silences umzug's per-step log lines. */
export function createMigrator(sequelize: Sequelize, quiet = false): Umzug<QueryInterface> {
  return new Umzug<QueryInterface>({
    migrations: MIGRATIONS.map(([name, m]) => ({
      name,
      up: ({ context }) => m.up({ context }),
      down: ({ context }) => m.down({ context }),
    })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'SequelizeMeta' }),
    logger: quiet ? undefined : console,
  });
}
