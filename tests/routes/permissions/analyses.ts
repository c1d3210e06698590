/**
 * Route × role cases for the analyses routes (run by tests/routes/permissions.test.ts). Anyone
 * who can read a design may start, list and read its analyses (viewers too: a run changes
 * nothing); cancelling is for the starter or a team owner. The cancel and read targets are
 * inserted directly (no worker runs here) and belong to an extra member, so no fixture user's
 * open-run limit is touched.
 */
import { afterAll } from 'vitest';
import * as designAnalyses from '@/app/api/designs/[designId]/analyses/route';
import * as analysis from '@/app/api/analyses/[analysisId]/route';
import { db } from '@/lib/db';
import { stopWebBoss } from '@/lib/jobs/boss';
import { addMember, makeUser, type AnyHandler, type Fixtures } from '../helpers';
import { MEMBERS_READ, OWNER_ONLY, newDesignFor, type Case } from './shared';

// POST sends a job through the web side's queue client; close it with the matrix's file.
afterAll(() => stopWebBoss());

/** A queued analysis of a fresh design, started by an extra viewer of the team. */
async function newRun(f: Fixtures): Promise<{ designId: string; analysisId: string }> {
  const designId = await newDesignFor(f);
  const starter = await makeUser('Starter');
  await addMember(f.teamId, starter.id, 'viewer');
  const a = await db().models.Analysis.create({
    designId,
    revision: 1,
    kind: 'sweep',
    spec: { kind: 'sweep', parameter: 'stages', from: 1, to: 2 },
    totalPoints: 2,
    createdBy: starter.id,
  });
  return { designId, analysisId: a.id };
}

export const analysesCases: Case[] = [
  {
    name: 'POST design analyses (members who can read may run)',
    handler: designAnalyses.POST as AnyHandler,
    method: 'POST',
    expect: [202, 202, 202, 202, 404, 401],
    prepare: async (f) => {
      const designId = await newDesignFor(f);
      return { path: `/api/designs/${designId}/analyses`, params: { designId }, body: { spec: { kind: 'spread', samples: 5, seed: 3 } } };
    },
  },
  {
    name: 'GET design analyses',
    handler: designAnalyses.GET as AnyHandler,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => {
      const { designId } = await newRun(f);
      return { path: `/api/designs/${designId}/analyses`, params: { designId } };
    },
  },
  {
    name: 'GET analysis',
    handler: analysis.GET as AnyHandler,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => {
      const { analysisId } = await newRun(f);
      return { path: `/api/analyses/${analysisId}`, params: { analysisId } };
    },
  },
  {
    name: "GET analysis of someone else's private design",
    handler: analysis.GET as AnyHandler,
    method: 'GET',
    expect: [404, 200, 404, 404, 404, 401],
    prepare: async (f) => {
      const designId = await newDesignFor(f, 'designer', 'private');
      const a = await db().models.Analysis.create({ designId, revision: 1, kind: 'spread', spec: { kind: 'spread', samples: 2, seed: 1, distribution: 'uniform', assumedTolerance: 0.1, loadTolerance: 0 }, totalPoints: 2, createdBy: f.users.designer.id });
      return { path: `/api/analyses/${a.id}`, params: { analysisId: a.id } };
    },
  },
  {
    name: "DELETE (cancel) someone else's analysis (team owner only)",
    handler: analysis.DELETE as AnyHandler,
    method: 'DELETE',
    expect: OWNER_ONLY(200),
    prepare: async (f) => {
      const { analysisId } = await newRun(f);
      return { path: `/api/analyses/${analysisId}`, params: { analysisId } };
    },
  },
];
