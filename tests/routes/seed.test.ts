/** The demo seed is idempotent: a second run adds no rows and changes none. */
import { execFileSync } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op, QueryTypes } from 'sequelize';
import { db } from '@/lib/db';
import { authorizeCredentials } from '@/lib/auth/options';
import { resetDatabase, teardown } from './helpers';

const root = path.resolve(import.meta.dirname, '../..');
const runSeed = () =>
  execFileSync(process.execPath, [path.join(root, 'node_modules/tsx/dist/cli.mjs'), 'scripts/seed.ts'], { cwd: root, env: { ...process.env }, encoding: 'utf8' });

async function counts() {
  const rows = await db().sequelize.query<Record<string, string>>(
    `SELECT (SELECT count(*) FROM users) AS users, (SELECT count(*) FROM teams) AS teams, (SELECT count(*) FROM memberships) AS memberships,
            (SELECT count(*) FROM designs) AS designs, (SELECT count(*) FROM design_revisions) AS revisions,
            (SELECT max(updated_at)::text FROM designs) AS last_update,
            (SELECT count(*) FROM review_requests) AS reviews, (SELECT count(*) FROM approvals) AS approvals,
            (SELECT count(*) FROM comments) AS comments, (SELECT count(*) FROM activity_events) AS events,
            (SELECT string_agg(status::text, ',' ORDER BY title) FROM designs) AS statuses`,
    { type: QueryTypes.SELECT },
  );
  return rows[0];
}

beforeAll(resetDatabase);
afterAll(teardown);

describe('scripts/seed.ts', () => {
  it('creates the demo team, people, designs and a fork once; a second run changes nothing', async () => {
    const out = runSeed();
    expect(out).toContain('ada.owner@tallgrass.test');
    expect(out).not.toMatch(/\$2[aby]\$|NEXTAUTH_SECRET/);
    const first = await counts();
    expect(first).toMatchObject({ users: '5', teams: '2', memberships: '5', designs: '4' });
    expect(Number(first.revisions)).toBeGreaterThanOrEqual(8);
    // the review story: changes asked at r2, approved at r3; one open review; pinned comments
    expect(first).toMatchObject({ reviews: '3', approvals: '1', comments: '3', statuses: 'draft,draft,in_review,approved' });
    expect(Number(first.events)).toBeGreaterThanOrEqual(8);
    runSeed();
    expect(await counts()).toEqual(first);
    const forks = await db().models.Design.findAll({ where: { forkedFromDesignId: { [Op.ne]: null } } });
    expect(forks).toHaveLength(1);
    const listed = await db().models.Design.findAll({ attributes: ['title', 'topology', 'stages'], order: [['title', 'ASC']], raw: true });
    expect(listed.map((d) => [d.topology, d.stages])).toEqual([
      ['half-wave', 4],
      ['half-wave', 3],
      ['half-wave', 6],
      ['symmetric', 4],
    ]);
    expect(await authorizeCredentials({ email: 'val.viewer@tallgrass.test', password: 'kilorung-demo-1' })).toMatchObject({ email: 'val.viewer@tallgrass.test' });
  });
});
