/** Route × role cases for the audit log (run by tests/routes/permissions.test.ts). */
import * as audit from '@/app/api/teams/[teamId]/audit/route';
import { OWNER_ONLY, type Case } from './shared';

export const hardeningCases: Case[] = [
  {
    name: 'GET audit log (owners only)',
    handler: audit.GET,
    method: 'GET',
    expect: OWNER_ONLY(200),
    prepare: async (f) => ({ path: `/api/teams/${f.teamId}/audit?limit=5`, params: { teamId: f.teamId } }),
  },
];
