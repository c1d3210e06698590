/**
 * Demo data (`npm run db:seed`), an invented scenario: the team "Tallgrass Instruments" with one
 * person per role, an outsider in "Quarry Lab", three designs built from the starter ladders with
 * a few revisions each, and one fork. Idempotent: every row has a fixed id and is only created
 * when missing, so running it again changes nothing. Prints the demo sign-ins, nothing secret.
 *
 * Uses models directly (not lib/data, which is `server-only` and needs a signed-in caller).
 */
import { closeDb, db } from '../lib/db';
import { hashPassword } from '../lib/auth/password';
import { halfWaveStarter, symmetricStarter, type StarterOptions } from '../lib/circuit/document/starters';
import { designDocumentSchema, type DesignDocument, type DiodeSpec } from '../lib/circuit/document/schema';
import { summariseTopology } from '../lib/data/topology';
import { compileDocument } from '../lib/circuit/compile/compile';
import type { CommentAnchor, Role } from '../lib/api/contract';
import type { Transaction } from 'sequelize';
import { seedBench } from './seed-bench';
import { seedParts } from './seed-parts';
import { seedBindings } from './seed-bindings';

/** The demo password of every seeded person (printed by `npm run app`, written in the README). */
export const DEMO_PASSWORD = 'kilorung-demo-1';

const id = (group: number, n: number) => `${group.toString(16).padStart(8, '0')}-5eed-4000-8000-${n.toString(16).padStart(12, '0')}`;

const PEOPLE: { key: string; name: string; email: string }[] = [
  { key: 'ada', name: 'Ada', email: 'ada.owner@tallgrass.test' },
  { key: 'dev', name: 'Dev', email: 'dev.designer@tallgrass.test' },
  { key: 'rue', name: 'Rue', email: 'rue.reviewer@tallgrass.test' },
  { key: 'val', name: 'Val', email: 'val.viewer@tallgrass.test' },
  { key: 'oskar', name: 'Oskar', email: 'oskar.outsider@quarry.test' },
];
/** Seeded person key → user id (the fixed id, or the id of an account that already had the address). */
const userIds = new Map<string, string>();
const userId = (key: string) => userIds.get(key) ?? id(1, PEOPLE.findIndex((p) => p.key === key) + 1);

const TEAMS = [
  { id: id(2, 1), name: 'Tallgrass Instruments', members: [['ada', 'owner'], ['dev', 'designer'], ['rue', 'reviewer'], ['val', 'viewer']] as [string, Role][] },
  { id: id(2, 2), name: 'Quarry Lab', members: [['oskar', 'owner']] as [string, Role][] },
];

/** An invented high-voltage rectifier stack for the demo ladders (not a catalogue part). */
const HV_STACK: DiodeSpec = {
  model: { isA: 5e-9, n: 8, rsOhm: 20, bvV: 12_000 },
  ratedPivV: 10_000,
  ratedAvgCurrentA: 0.02,
  ratedSurgeA: 2,
  partId: 'generic-hv-stack-10k',
};
const SMALL_RECT: DiodeSpec = {
  model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 },
  ratedPivV: 1000,
  ratedAvgCurrentA: 1,
  partId: 'generic-rect-1k',
};

interface RevisionSpec {
  author: string;
  message: string;
  document: DesignDocument;
}
interface DesignSpec {
  id: string;
  title: string;
  description: string;
  author: string;
  revisions: RevisionSpec[];
  forkOf?: { designId: string; revision: number };
}

const xray = (o: Partial<StarterOptions> = {}) =>
  symmetricStarter(4, { amplitudeV: 2500, frequencyHz: 40_000, capacitanceF: 1e-9, capacitorRatedV: 6000, diode: HV_STACK, loadCurrentA: 250e-6, sourceResistanceOhm: 5, ...o });
const bias = (n: number, o: Partial<StarterOptions> = {}) =>
  halfWaveStarter(n, { amplitudeV: 250, frequencyHz: 50_000, capacitanceF: 10e-9, capacitorRatedV: 630, diode: SMALL_RECT, loadCurrentA: 100e-6, ...o });
const precipitator = (n: number, o: Partial<StarterOptions> = {}) =>
  halfWaveStarter(n, { amplitudeV: 3000, frequencyHz: 20_000, capacitanceF: 10e-9, capacitorRatedV: 8000, diode: HV_STACK, loadCurrentA: 1e-3, sourceResistanceOhm: 10, ...o });

const DESIGNS: DesignSpec[] = [
  {
    id: id(3, 1),
    title: '±20 kV bipolar supply — compact X-ray tube',
    description: 'Symmetric pair of 4-stage ladders from a 40 kHz inverter: +20 kV and −20 kV about ground, 40 kV across a compact tube at 0.25 mA.',
    author: 'ada',
    revisions: [
      { author: 'ada', message: 'First cut: 4 + 4 stages, 1 nF', document: xray() },
      { author: 'dev', message: 'Stage capacitors 1 nF → 2.2 nF to bring the ripple down', document: xray({ capacitanceF: 2.2e-9 }) },
      { author: 'ada', message: 'Bleeder fitted across the output (1 GΩ)', document: xray({ capacitanceF: 2.2e-9, bleederOhm: 1e9 }) },
    ],
  },
  {
    id: id(3, 2),
    title: '1.5 kV detector bias ladder',
    description: 'Half-wave ladder for a detector bias rail: about 1.5 kV at 0.1 mA from a 50 kHz drive.',
    author: 'dev',
    revisions: [
      { author: 'dev', message: '3 stages from 250 V peak', document: bias(3) },
      { author: 'dev', message: 'Stage added; drive lowered to 190 V peak', document: bias(4, { amplitudeV: 190 }) },
    ],
  },
  {
    id: id(3, 3),
    title: '30 kV precipitator test ladder',
    description: 'Bench ladder for precipitator cell tests: 30 kV open-circuit from 3 kV peak at 20 kHz, 1 mA load.',
    author: 'ada',
    revisions: [
      { author: 'ada', message: '5 stages, 10 nF', document: precipitator(5) },
      { author: 'dev', message: 'Capacitors 10 nF → 22 nF: droop under 1 mA was too large', document: precipitator(5, { capacitanceF: 22e-9 }) },
      { author: 'ada', message: 'Stage added; drive 2.5 kV peak for lower part stress', document: precipitator(6, { capacitanceF: 22e-9, amplitudeV: 2500 }) },
    ],
  },
  {
    id: id(3, 4),
    title: '1.5 kV detector bias — low-ripple variant',
    description: 'Fork of the detector bias ladder with larger capacitors.',
    author: 'ada',
    forkOf: { designId: id(3, 2), revision: 1 },
    revisions: [
      { author: 'ada', message: 'Forked from 1.5 kV detector bias ladder r1', document: bias(3) },
      { author: 'ada', message: 'Capacitors 10 nF → 47 nF', document: bias(3, { capacitanceF: 47e-9 }) },
    ],
  },
];

const DAY_MS = 24 * 60 * 60 * 1000;
const HOUR_MS = 60 * 60 * 1000;

/** The output node name the compiler gives a document (for comments pinned to it). */
function outputNode(doc: DesignDocument): string {
  const r = compileDocument(doc);
  if (!r.ok || r.topology.outputs.length === 0) throw new Error(`demo document does not compile: ${r.ok ? 'no output' : r.reason}`);
  return r.topology.outputs[0].node;
}

/**
 * The review story of the demo: the X-ray supply went to Rue at r2, came back with changes
 * (fit a bleeder), was approved at r3; the precipitator ladder waits for Rue's review of r3; a
 * few comments pinned to nodes and parts, one resolved; the matching activity events. Every row
 * has a fixed id and is only created when missing.
 */
async function seedCollaboration(transaction: Transaction, revisionTimes: Map<string, number[]>): Promise<number> {
  const { models } = db();
  const xray = DESIGNS[0];
  const precip = DESIGNS[2];
  const teamId = TEAMS[0].id;
  const at = (designId: string, revision: number, plusHours: number) => new Date((revisionTimes.get(designId)?.[revision - 1] ?? Date.now() - DAY_MS) + plusHours * HOUR_MS);
  const path = (designId: string, revision: number, key: 'review' | 'comment', itemId: string) => `/designs/${designId}?revision=${revision}&${key}=${itemId}`;
  let made = 0;
  const reviews = [
    { id: id(5, 1), design: xray, revision: 2, by: 'ada', reviewer: 'rue', note: 'Ripple at 0.25 mA and the stage capacitor ratings, please.', state: 'changes_requested' as const, decision: 'Ripple is fine now. There is no bleeder: fit one across the output before this goes near the bench.' },
    { id: id(5, 2), design: xray, revision: 3, by: 'ada', reviewer: 'rue', note: 'Bleeder fitted (1 GΩ).', state: 'approved' as const, decision: 'Approved for the bench build. Discharge stick and interlock as per the lab procedure.' },
    { id: id(5, 3), design: precip, revision: 3, by: 'ada', reviewer: 'rue', note: 'Six stages at 2.5 kV peak; check the top diode margin.', state: 'open' as const, decision: null },
  ];
  for (const r of reviews) {
    if (await models.ReviewRequest.findByPk(r.id, { transaction })) continue;
    const created = at(r.design.id, r.revision, 2);
    const decided = r.decision ? at(r.design.id, r.revision, 20) : null;
    await models.ReviewRequest.create(
      { id: r.id, designId: r.design.id, revision: r.revision, requestedById: userId(r.by), note: r.note, state: r.state, decidedById: r.decision ? userId(r.reviewer) : null, decidedAt: decided, decisionNote: r.decision, createdAt: created },
      { transaction },
    );
    await models.ReviewRequestReviewer.create({ reviewRequestId: r.id, userId: userId(r.reviewer) }, { transaction });
    if (r.state === 'approved') {
      await models.Approval.create({ id: id(6, 1), designId: r.design.id, reviewRequestId: r.id, revision: r.revision, approvedById: userId(r.reviewer), note: r.decision ?? '', createdAt: decided! }, { transaction });
    }
    const link = path(r.design.id, r.revision, 'review', r.id);
    const ev = await models.ActivityEvent.create({ kind: 'review_requested', teamId, designId: r.design.id, actorId: userId(r.by), summary: `Ada asked for a review of "${r.design.title}" r${r.revision}`, path: link, createdAt: created }, { transaction });
    await models.ActivityRecipient.create({ eventId: ev.id, userId: userId(r.reviewer) }, { transaction });
    if (r.decision) {
      const what = r.state === 'approved' ? 'approved' : 'asked for changes to';
      const dv = await models.ActivityEvent.create({ kind: 'review_decided', teamId, designId: r.design.id, actorId: userId(r.reviewer), summary: `Rue ${what} "${r.design.title}" r${r.revision}`, path: link, createdAt: decided! }, { transaction });
      await models.ActivityRecipient.create({ eventId: dv.id, userId: userId(r.by) }, { transaction });
    }
    made += 1;
  }
  await models.Design.update({ status: 'approved' }, { where: { id: xray.id, status: 'draft' }, transaction, silent: true });
  await models.Design.update({ status: 'in_review' }, { where: { id: precip.id, status: 'draft' }, transaction, silent: true });

  const xrayDocs = xray.revisions.map((r) => r.document);
  const precipDocs = precip.revisions.map((r) => r.document);
  const comments: { id: string; design: DesignSpec; revision: number; by: string; body: string; anchor: CommentAnchor; parent?: string; mentions?: string[]; resolvedBy?: string; hours: number }[] = [
    { id: id(7, 1), design: xray, revision: 2, by: 'rue', body: 'Nothing discharges this node when the inverter stops: with 2.2 nF per stage it holds charge for hours. Needs a bleeder.', anchor: { kind: 'node', node: outputNode(xrayDocs[1]) }, resolvedBy: 'ada', hours: 18 },
    { id: id(7, 2), design: xray, revision: 2, by: 'ada', body: '@Rue agreed, 1 GΩ across the output in r3.', anchor: { kind: 'node', node: outputNode(xrayDocs[1]) }, parent: id(7, 1), mentions: ['rue'], hours: 30 },
    { id: id(7, 3), design: precip, revision: 3, by: 'rue', body: 'The top stage diode sees close to its rating at full drive; is there a part with more headroom? @Dev', anchor: { kind: 'part', blockId: precipDocs[2].blocks.filter((b) => b.kind === 'stage').at(-1)!.id }, mentions: ['dev'], hours: 26 },
  ];
  for (const c of comments) {
    if (await models.Comment.findByPk(c.id, { transaction })) continue;
    const createdAt = at(c.design.id, c.revision, c.hours);
    await models.Comment.create(
      {
        id: c.id,
        designId: c.design.id,
        revision: c.revision,
        parentId: c.parent ?? null,
        authorId: userId(c.by),
        body: c.body,
        anchor: c.anchor,
        mentionIds: (c.mentions ?? []).map(userId),
        resolvedAt: c.resolvedBy ? at(c.design.id, c.revision, c.hours + 14) : null,
        resolvedById: c.resolvedBy ? userId(c.resolvedBy) : null,
        createdAt,
      },
      { transaction },
    );
    const ev = await models.ActivityEvent.create(
      { kind: c.mentions ? 'mention' : 'comment', teamId, designId: c.design.id, actorId: userId(c.by), summary: `${PEOPLE.find((p) => p.key === c.by)!.name} commented on "${c.design.title}" r${c.revision}`, path: path(c.design.id, c.revision, 'comment', c.parent ?? c.id), createdAt },
      { transaction },
    );
    const to = c.mentions ?? [c.design.author];
    for (const k of to.filter((k) => k !== c.by)) await models.ActivityRecipient.create({ eventId: ev.id, userId: userId(k) }, { transaction });
    made += 1;
  }
  return made;
}

async function seed(): Promise<void> {
  const { sequelize, models } = db();
  const created = { users: 0, teams: 0, designs: 0, collaboration: 0 };
  const hash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    for (const [i, p] of PEOPLE.entries()) {
      const [user, isNew] = await models.User.findOrCreate({
        where: { email: p.email },
        defaults: { id: id(1, i + 1), name: p.name, email: p.email, passwordHash: hash, emailVerified: new Date(), image: null },
        transaction,
      });
      userIds.set(p.key, user.id);
      if (isNew) created.users += 1;
    }
    for (const t of TEAMS) {
      const [, isNew] = await models.Team.findOrCreate({ where: { id: t.id }, defaults: { id: t.id, name: t.name }, transaction });
      if (isNew) created.teams += 1;
      for (const [key, role] of t.members) {
        await models.Membership.findOrCreate({ where: { teamId: t.id, userId: userId(key) }, defaults: { teamId: t.id, userId: userId(key), role }, transaction });
      }
    }
    const start = Date.now() - 30 * DAY_MS;
    const revisionTimes = new Map<string, number[]>();
    for (const [k, d] of DESIGNS.entries()) {
      if (await models.Design.findByPk(d.id, { transaction })) continue;
      const docs = d.revisions.map((r) => designDocumentSchema.parse(r.document));
      const { topology, stages } = summariseTopology(docs[docs.length - 1]);
      const createdAt = new Date(start + k * 5 * DAY_MS);
      await models.Design.create(
        {
          id: d.id,
          teamId: TEAMS[0].id,
          authorId: userId(d.author),
          title: d.title,
          description: d.description,
          visibility: 'team',
          archivedAt: null,
          forkedFromDesignId: d.forkOf?.designId ?? null,
          forkedFromRevision: d.forkOf?.revision ?? null,
          latestRevision: docs.length,
          topology,
          stages,
          createdAt,
        },
        { transaction },
      );
      let at = createdAt.getTime();
      const times: number[] = [];
      revisionTimes.set(d.id, times);
      for (const [n, r] of d.revisions.entries()) {
        at += (n === 0 ? 0 : 1 + n) * DAY_MS;
        times.push(at);
        await models.DesignRevision.create(
          { id: id(4, (k + 1) * 100 + n + 1), designId: d.id, number: n + 1, document: docs[n], authorId: userId(r.author), message: r.message, createdAt: new Date(at) },
          { transaction },
        );
      }
      await sequelize.query('UPDATE designs SET updated_at = :at WHERE id = :id', { replacements: { at: new Date(at), id: d.id }, transaction });
      created.designs += 1;
    }
    created.collaboration = await seedCollaboration(transaction, revisionTimes);
    const benchMade = await seedBench(transaction, { designId: id(3, 2), revision: 2, uploadedById: userId('dev') });
    if (benchMade) console.log(`[seed] created ${benchMade} bench dataset(s) (invented demo data)`);
    const partsMade = await seedParts(transaction, { teamId: TEAMS[0].id, createdBy: userId('dev') });
    if (partsMade) console.log(`[seed] created ${partsMade} library part(s) (invented makers and part numbers)`);
    const boundMade = await seedBindings(transaction, { teamId: TEAMS[0].id, authorId: userId('ada') });
    if (boundMade) console.log('[seed] bound the low-ripple fork\'s stage diodes to a library part (a new revision)');
  });
  console.log(`[seed] created ${created.users} user(s), ${created.teams} team(s), ${created.designs} design(s), ${created.collaboration} review(s) and comment(s) (existing rows left as they were)`);
  console.log(`[seed] demo sign-ins (password for all: ${DEMO_PASSWORD}):`);
  for (const [i, p] of PEOPLE.entries()) {
    const team = TEAMS.find((t) => t.members.some(([key]) => key === p.key))!;
    const role = team.members.find(([key]) => key === p.key)![1];
    console.log(`[seed]   ${p.email.padEnd(30)} ${role.padEnd(9)} ${team.name}${i === PEOPLE.length - 1 ? ' (outsider)' : ''}`);
  }
}

if (!process.env.DATABASE_URL) {
  console.error('[seed] DATABASE_URL is not set (source scripts/env.sh)');
  process.exit(2);
}
process.env.NEXTAUTH_SECRET ??= 'seed-does-not-sign-anything';
try {
  await seed();
} catch (e) {
  console.error('[seed] failed:', e instanceof Error ? e.message : e);
  process.exitCode = 1;
} finally {
  await closeDb();
}
