/**
 * Comments pinned to a design, a node or a part of one revision, against the real database:
 * every action × role for writing, listing and resolving; designs of another team and private
 * designs of someone else answer 404; anchors checked against the revision's document; replies
 * follow their thread; mentions make an activity event and a mail with the exact link, unless
 * the person turned mention mail off.
 */
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as teamDesigns from '@/app/api/teams/[teamId]/designs/route';
import * as design from '@/app/api/designs/[designId]/route';
import * as revisions from '@/app/api/designs/[designId]/revisions/route';
import * as comments from '@/app/api/designs/[designId]/comments/route';
import * as comment from '@/app/api/comments/[commentId]/route';
import * as activity from '@/app/api/activity/route';
import * as notifications from '@/app/api/me/notifications/route';
import type { ActivityDto, CommentDto, DesignDetailDto } from '@/lib/api/contract';
import { fullWaveStarter } from '@/lib/circuit/document/starters';
import { flushMail } from '@/lib/data/activity';
import { db } from '@/lib/db';
import { addMember, call, freshEmail, mailFor, makeUser, sampleDocument, setupFixtures, teardown, WHO, type Fixtures, type FixtureUser, type Who } from './helpers';

let f: Fixtures;
/** Team members with names of several words, one a prefix of the other. */
let annMarie: FixtureUser;
let annMarieQuill: FixtureUser;

beforeAll(async () => {
  f = await setupFixtures();
  annMarie = await makeUser('Ann Marie', freshEmail('annmarie'));
  annMarieQuill = await makeUser('Ann Marie Quill', freshEmail('quill'));
  await addMember(f.teamId, annMarie.id, 'reviewer');
  await addMember(f.teamId, annMarieQuill.id, 'viewer');
});
afterAll(teardown);

type ErrorBody = { error?: { code: string; message: string; field?: string } };
type CommentAnswer = { comment: CommentDto } & ErrorBody;
type ListAnswer = { comments: CommentDto[] } & ErrorBody;

async function create(title: string, o: { as?: FixtureUser; teamId?: string; visibility?: 'team' | 'private' } = {}): Promise<DesignDetailDto> {
  const teamId = o.teamId ?? f.teamId;
  const res = await call<{ design: DesignDetailDto }>(teamDesigns.POST, `/api/teams/${teamId}/designs`, {
    method: 'POST',
    params: { teamId },
    as: o.as ?? f.users.designer,
    body: { title, visibility: o.visibility, document: sampleDocument(10e-9), message: 'start' },
  });
  expect(res.status).toBe(201);
  return res.body.design;
}

function post(designId: string, as: FixtureUser, body: Record<string, unknown>) {
  return call<CommentAnswer>(comments.POST, `/api/designs/${designId}/comments`, { method: 'POST', params: { designId }, as, body });
}

function list(designId: string, as: FixtureUser, revision?: number) {
  return call<ListAnswer>(comments.GET, `/api/designs/${designId}/comments`, { params: { designId }, as, query: revision ? { revision: String(revision) } : {} });
}

function resolve(commentId: string, as: FixtureUser, resolved: boolean) {
  return call<CommentAnswer>(comment.PATCH, `/api/comments/${commentId}`, { method: 'PATCH', params: { commentId }, as, body: { resolved } });
}

async function feed(as: FixtureUser): Promise<ActivityDto[]> {
  const res = await call<{ events: ActivityDto[] }>(activity.GET, '/api/activity', { as });
  expect(res.status).toBe(200);
  return res.body.events;
}

const onDesign = { kind: 'design' } as const;

describe('writing a comment', () => {
  it('owners, designers and reviewers write; viewers 403; outsiders 404', async () => {
    const d = await create('Commented ladder');
    const expected: Record<Who, number> = { owner: 201, designer: 201, reviewer: 201, viewer: 403, outsider: 404 };
    for (const who of WHO) {
      const res = await post(d.id, f.users[who], { revision: 1, body: `  from ${who}  `, anchor: onDesign });
      expect({ who, status: res.status }).toEqual({ who, status: expected[who] });
      if (res.status === 201) {
        expect(res.body.comment).toMatchObject({
          designId: d.id,
          revision: 1,
          parentId: null,
          author: { id: f.users[who].id, name: f.users[who].name },
          body: `from ${who}`,
          anchor: onDesign,
          mentions: [],
          resolved: false,
          resolvedBy: null,
          replies: [],
          canResolve: true,
        });
      } else {
        expect(res.body.error?.code).toBe(who === 'viewer' ? 'forbidden' : 'not_found');
      }
    }
    const all = await list(d.id, f.users.viewer);
    expect(all.body.comments.map((c) => c.body)).toEqual(['from owner', 'from designer', 'from reviewer']);
  });

  it('a design of another team, a private design of someone else and an unknown id are 404', async () => {
    const theirs = await create('Elsewhere ladder', { as: f.users.outsider, teamId: f.otherTeamId });
    const priv = await create('Private ladder', { as: f.users.designer, visibility: 'private' });
    for (const who of ['owner', 'designer', 'reviewer'] as const) {
      const res = await post(theirs.id, f.users[who], { revision: 1, body: 'hello', anchor: onDesign });
      expect({ who, status: res.status, code: res.body.error?.code }).toEqual({ who, status: 404, code: 'not_found' });
      expect((await list(theirs.id, f.users[who])).status).toBe(404);
    }
    for (const who of ['owner', 'reviewer', 'outsider'] as const) {
      expect((await post(priv.id, f.users[who], { revision: 1, body: 'hello', anchor: onDesign })).status).toBe(404);
      expect((await list(priv.id, f.users[who])).status).toBe(404);
    }
    // the author of the private design comments on it
    expect((await post(priv.id, f.users.designer, { revision: 1, body: 'note to self', anchor: onDesign })).status).toBe(201);
    expect((await post(randomUUID(), f.users.owner, { revision: 1, body: 'hello', anchor: onDesign })).status).toBe(404);
    expect((await post('not-a-uuid', f.users.owner, { revision: 1, body: 'hello', anchor: onDesign })).status).toBe(404);
    expect(await db().models.Comment.count({ where: { designId: theirs.id } })).toBe(0);
  });

  it('an archived design takes no comments (409); unauthenticated is 401', async () => {
    const d = await create('Archived ladder');
    const arch = await call(design.PATCH, `/api/designs/${d.id}`, { method: 'PATCH', params: { designId: d.id }, as: f.users.owner, body: { archived: true } });
    expect(arch.status).toBe(200);
    const res = await post(d.id, f.users.reviewer, { revision: 1, body: 'too late', anchor: onDesign });
    expect({ status: res.status, code: res.body.error?.code }).toEqual({ status: 409, code: 'conflict' });
    expect((await post(d.id, null as unknown as FixtureUser, { revision: 1, body: 'x', anchor: onDesign })).status).toBe(401);
    expect((await list(d.id, null as unknown as FixtureUser)).status).toBe(401);
  });

  it('pins to a node the compiler names and to a block or a part of it; anything else is 422 with its field', async () => {
    const d = await create('Pinned ladder');
    const ok = [
      { kind: 'node', node: 'y_s3' },
      { kind: 'node', node: 'x_s1' },
      { kind: 'part', blockId: 's2' },
      { kind: 'part', blockId: 's2', part: 'pumpC' },
      { kind: 'part', blockId: 's3', part: 'diodeB' },
      { kind: 'part', blockId: 'load' },
    ];
    for (const anchor of ok) {
      const res = await post(d.id, f.users.reviewer, { revision: 1, body: 'looks fine', anchor });
      expect({ anchor, status: res.status }).toEqual({ anchor, status: 201 });
      expect(res.body.comment.anchor).toEqual(anchor);
    }
    const bad: [string, Record<string, unknown>, string][] = [
      ['a node no net has', { revision: 1, body: 'x', anchor: { kind: 'node', node: 'out' } }, 'anchor'],
      ['a block that does not exist', { revision: 1, body: 'x', anchor: { kind: 'part', blockId: 's9' } }, 'anchor'],
      ['a part a half-wave stage lacks', { revision: 1, body: 'x', anchor: { kind: 'part', blockId: 's1', part: 'pump2C' } }, 'anchor'],
      ['a part name that is no part', { revision: 1, body: 'x', anchor: { kind: 'part', blockId: 's1', part: 'lid' } }, 'anchor'],
      ['a part of a single-part block', { revision: 1, body: 'x', anchor: { kind: 'part', blockId: 'load', part: 'pumpC' } }, 'anchor'],
      ['an unknown anchor kind', { revision: 1, body: 'x', anchor: { kind: 'wire', id: 'w1' } }, 'anchor.kind'],
      ['a revision that does not exist', { revision: 2, body: 'x', anchor: onDesign }, 'revision'],
      ['revision zero', { revision: 0, body: 'x', anchor: onDesign }, 'revision'],
      ['an empty body', { revision: 1, body: '   ', anchor: onDesign }, 'body'],
      ['a body over 4000 characters', { revision: 1, body: 'x'.repeat(4001), anchor: onDesign }, 'body'],
    ];
    for (const [name, body, field] of bad) {
      const res = await post(d.id, f.users.reviewer, body);
      expect({ name, status: res.status, field: res.body.error?.field }).toEqual({ name, status: 422, field });
    }
    expect((await list(d.id, f.users.viewer)).body.comments).toHaveLength(ok.length);
    expect((await post(d.id, f.users.reviewer, { revision: 1, body: 'x'.repeat(4000), anchor: onDesign })).status).toBe(201);
  });

  it('checks the anchor against the named revision: a full-wave revision has pump2C, the half-wave one does not', async () => {
    const d = await create('Regrown ladder');
    const doc = fullWaveStarter(2, { amplitudeV: 1000, frequencyHz: 20_000, capacitanceF: 10e-9, loadCurrentA: 1e-4 });
    const saved = await call(revisions.POST, `/api/designs/${d.id}/revisions`, { method: 'POST', params: { designId: d.id }, as: f.users.designer, body: { baseRevision: 1, document: doc, message: 'full-wave' } });
    expect(saved.status).toBe(201);
    const anchor = { kind: 'part', blockId: 's1', part: 'pump2C' };
    expect((await post(d.id, f.users.reviewer, { revision: 2, body: 'second column', anchor })).status).toBe(201);
    expect((await post(d.id, f.users.reviewer, { revision: 1, body: 'second column', anchor })).body.error?.field).toBe('anchor');
    // s3 exists in r1 only
    expect((await post(d.id, f.users.reviewer, { revision: 1, body: 'top', anchor: { kind: 'node', node: 'y_s3' } })).status).toBe(201);
    expect((await post(d.id, f.users.reviewer, { revision: 2, body: 'top', anchor: { kind: 'node', node: 'y_s3' } })).body.error?.field).toBe('anchor');
    // the revision filter of the list
    expect((await list(d.id, f.users.viewer, 2)).body.comments.map((c) => c.body)).toEqual(['second column']);
    expect((await list(d.id, f.users.viewer, 1)).body.comments.map((c) => c.body)).toEqual(['top']);
    expect((await list(d.id, f.users.viewer)).body.comments).toHaveLength(2);
    const badQuery = await call<ErrorBody>(comments.GET, `/api/designs/${d.id}/comments`, { params: { designId: d.id }, as: f.users.viewer, query: { revision: 'two' } });
    expect({ status: badQuery.status, field: badQuery.body.error?.field }).toEqual({ status: 422, field: 'revision' });
  });

  it('a node anchor on a revision that does not compile is 422 (a part anchor still works)', async () => {
    const d = await create('Broken ladder');
    const doc = sampleDocument();
    doc.blocks = doc.blocks.filter((b) => b.kind !== 'ground');
    doc.wires = doc.wires.filter((w) => w.source !== 'gnd' && w.target !== 'gnd');
    doc.blocks.push({ id: 'vdc', kind: 'dcSource', position: { x: 0, y: 0 }, data: { voltageV: 5, sourceResistanceOhm: 0 } });
    doc.wires.push({ id: 'short', source: 'vdc', sourcePort: 'pos', target: 'vdc', targetPort: 'neg' });
    const saved = await call(revisions.POST, `/api/designs/${d.id}/revisions`, { method: 'POST', params: { designId: d.id }, as: f.users.designer, body: { baseRevision: 1, document: doc, message: 'broken' } });
    expect(saved.status).toBe(201);
    const node = await post(d.id, f.users.reviewer, { revision: 2, body: 'where is ground?', anchor: { kind: 'node', node: 'x_s1' } });
    expect({ status: node.status, field: node.body.error?.field }).toEqual({ status: 422, field: 'anchor' });
    expect(node.body.error?.message).toMatch(/does not compile/);
    expect((await post(d.id, f.users.reviewer, { revision: 2, body: 'shorted', anchor: { kind: 'part', blockId: 'vdc' } })).status).toBe(201);
  });
});

describe('replies', () => {
  it('follow the thread’s revision and anchor, list oldest first under it, and cannot nest or cross designs', async () => {
    const d = await create('Threaded ladder');
    const other = await create('Other ladder');
    const top = await post(d.id, f.users.reviewer, { revision: 1, body: 'is C2 rated for this?', anchor: { kind: 'part', blockId: 's2', part: 'smoothC' } });
    expect(top.status).toBe(201);
    const threadId = top.body.comment.id;
    const r1 = await post(d.id, f.users.designer, { revision: 7, body: 'yes, 5 kV', anchor: onDesign, parentId: threadId });
    expect(r1.status).toBe(201);
    expect(r1.body.comment).toMatchObject({ parentId: threadId, revision: 1, anchor: { kind: 'part', blockId: 's2', part: 'smoothC' }, body: 'yes, 5 kV', replies: [], canResolve: false });
    const r2 = await post(d.id, f.users.owner, { revision: 1, body: 'agreed', anchor: onDesign, parentId: threadId });
    expect(r2.status).toBe(201);
    // viewers cannot reply either
    expect((await post(d.id, f.users.viewer, { revision: 1, body: 'me too', anchor: onDesign, parentId: threadId })).status).toBe(403);
    // a reply to a reply, a comment of another design, an unknown id
    for (const parentId of [r1.body.comment.id, randomUUID()]) {
      const res = await post(d.id, f.users.owner, { revision: 1, body: 'nested', anchor: onDesign, parentId });
      expect({ status: res.status, field: res.body.error?.field }).toEqual({ status: 422, field: 'parentId' });
    }
    const elsewhere = await post(other.id, f.users.owner, { revision: 1, body: 'wrong design', anchor: onDesign, parentId: threadId });
    expect({ status: elsewhere.status, field: elsewhere.body.error?.field }).toEqual({ status: 422, field: 'parentId' });

    const later = await post(d.id, f.users.owner, { revision: 1, body: 'second thread', anchor: { kind: 'node', node: 'y_s3' } });
    const all = (await list(d.id, f.users.viewer)).body.comments;
    expect(all.map((c) => [c.id, c.replies.map((r) => r.body)])).toEqual([
      [threadId, ['yes, 5 kV', 'agreed']],
      [later.body.comment.id, []],
    ]);
    expect(all[0].replies.map((r) => r.author.id)).toEqual([f.users.designer.id, f.users.owner.id]);
    expect(all.every((c) => c.canResolve === false)).toBe(true);
    expect((await list(d.id, f.users.reviewer)).body.comments.every((c) => c.canResolve && c.replies.every((r) => !r.canResolve))).toBe(true);

    // the thread's earlier writers hear of a reply in their feed (no mail for comments)
    await post(d.id, f.users.reviewer, { revision: 1, body: 'thanks both', anchor: onDesign, parentId: threadId });
    const path = `/designs/${d.id}?revision=1&comment=${threadId}`;
    for (const who of ['designer', 'owner'] as const) {
      const mine = (await feed(f.users[who])).filter((e) => e.kind === 'comment' && e.forYou && e.summary.includes('Reviewer replied'));
      expect(mine.map((e) => e.path), who).toEqual([path]);
    }
    // the writer is not told of their own reply
    expect((await feed(f.users.reviewer)).some((e) => e.kind === 'comment' && e.forYou && e.design?.id === d.id && e.summary.includes('Reviewer replied'))).toBe(false);
  });
});

describe('resolving', () => {
  it('owners, designers and reviewers resolve and reopen; viewers 403; outsiders 404; replies 422', async () => {
    const d = await create('Resolved ladder');
    const top = await post(d.id, f.users.owner, { revision: 1, body: 'bleeder missing', anchor: onDesign });
    const reply = await post(d.id, f.users.designer, { revision: 1, body: 'added', anchor: onDesign, parentId: top.body.comment.id });
    const id = top.body.comment.id;
    const expected: Record<Who, number> = { owner: 200, designer: 200, reviewer: 200, viewer: 403, outsider: 404 };
    for (const who of WHO) {
      const res = await resolve(id, f.users[who], true);
      expect({ who, status: res.status }).toEqual({ who, status: expected[who] });
      if (res.status === 200) {
        expect(res.body.comment).toMatchObject({ id, resolved: true, resolvedBy: { id: expect.any(String) }, replies: [{ id: reply.body.comment.id }] });
        const reopened = await resolve(id, f.users[who], false);
        expect(reopened.status).toBe(200);
        expect(reopened.body.comment).toMatchObject({ id, resolved: false, resolvedBy: null, resolvedAt: null });
      } else if (who === 'outsider') {
        expect(res.body.error).toMatchObject({ code: 'not_found', message: 'comment not found' });
      }
    }
    const byReviewer = await resolve(id, f.users.reviewer, true);
    expect(byReviewer.body.comment.resolvedBy?.id).toBe(f.users.reviewer.id);
    expect(Date.parse(byReviewer.body.comment.resolvedAt ?? '')).toBeGreaterThan(Date.now() - 60_000);
    // resolving again changes nothing
    const again = await resolve(id, f.users.owner, true);
    expect(again.body.comment).toMatchObject({ resolvedBy: { id: f.users.reviewer.id }, resolvedAt: byReviewer.body.comment.resolvedAt });
    expect((await list(d.id, f.users.viewer)).body.comments[0]).toMatchObject({ id, resolved: true, resolvedBy: { id: f.users.reviewer.id } });

    const replyRes = await resolve(reply.body.comment.id, f.users.owner, true);
    expect({ status: replyRes.status, field: replyRes.body.error?.field }).toEqual({ status: 422, field: 'resolved' });
    expect((await resolve(randomUUID(), f.users.owner, true)).body.error).toMatchObject({ code: 'not_found', message: 'comment not found' });
    const badBody = await call<ErrorBody>(comment.PATCH, `/api/comments/${id}`, { method: 'PATCH', params: { commentId: id }, as: f.users.owner, body: { resolved: 'yes' } });
    expect({ status: badBody.status, field: badBody.body.error?.field }).toEqual({ status: 422, field: 'resolved' });

    // the comment's author hears of it (no mail)
    const owned = (await feed(f.users.owner)).filter((e) => e.kind === 'comment_resolved' && e.forYou && e.design?.id === d.id);
    expect(owned.length).toBeGreaterThanOrEqual(4);
    expect(owned[0]).toMatchObject({ summary: expect.stringContaining('Reviewer resolved'), path: `/designs/${d.id}?revision=1&comment=${id}` });
  });

  it('a comment of another team’s design or of someone else’s private design is 404 comment', async () => {
    const theirs = await create('Their ladder', { as: f.users.outsider, teamId: f.otherTeamId });
    const c = await post(theirs.id, f.users.outsider, { revision: 1, body: 'ours', anchor: onDesign });
    expect(c.status).toBe(201);
    for (const who of ['owner', 'designer', 'reviewer', 'viewer'] as const) {
      const res = await resolve(c.body.comment.id, f.users[who], true);
      expect({ who, status: res.status, message: res.body.error?.message }).toEqual({ who, status: 404, message: 'comment not found' });
    }
    const priv = await create('Secret ladder', { as: f.users.owner, visibility: 'private' });
    const mine = await post(priv.id, f.users.owner, { revision: 1, body: 'private note', anchor: onDesign });
    expect((await resolve(mine.body.comment.id, f.users.designer, true)).status).toBe(404);
    expect((await resolve(mine.body.comment.id, f.users.owner, true)).status).toBe(200);
    expect((await db().models.Comment.findByPk(c.body.comment.id))?.resolvedAt).toBeNull();
  });

  it('an archived design’s comments list with canResolve false and cannot be resolved (409)', async () => {
    const d = await create('Shelved ladder');
    const top = await post(d.id, f.users.reviewer, { revision: 1, body: 'old point', anchor: onDesign });
    await call(design.PATCH, `/api/designs/${d.id}`, { method: 'PATCH', params: { designId: d.id }, as: f.users.owner, body: { archived: true } });
    expect((await list(d.id, f.users.owner)).body.comments.map((c) => c.canResolve)).toEqual([false]);
    expect((await resolve(top.body.comment.id, f.users.owner, true)).status).toBe(409);
  });
});

describe('mentions', () => {
  it('stores the longest team member name; the mentioned get a mention event and a mail with the exact link', async () => {
    const d = await create('Mentioned ladder');
    const body = '@ann marie quill and @Ann Marie: please look at the top smoothing node. Not @Outsider.';
    const res = await post(d.id, f.users.reviewer, { revision: 1, body, anchor: { kind: 'node', node: 'y_s3' } });
    expect(res.status).toBe(201);
    const c = res.body.comment;
    expect(c.mentions.map((u) => u.id)).toEqual([annMarieQuill.id, annMarie.id]);
    expect(c.mentions[0]).toEqual({ id: annMarieQuill.id, name: 'Ann Marie Quill', email: annMarieQuill.email });
    expect((await db().models.Comment.findByPk(c.id))?.mentionIds).toEqual([annMarieQuill.id, annMarie.id]);

    await flushMail();
    const path = `/designs/${d.id}?revision=1&comment=${c.id}`;
    for (const u of [annMarieQuill, annMarie]) {
      const mail = (await mailFor(u.email)).find((m) => m.subject === 'You were mentioned on "Mentioned ladder"');
      expect(mail, u.name).toBeDefined();
      expect(mail!.text).toContain(`${process.env.NEXTAUTH_URL}${path}`);
      expect(mail!.text).toContain(body);
      expect(mail!.text).toContain('on node y_s3 (Output +)');
      const events = (await feed(u)).filter((e) => e.kind === 'mention' && e.design?.id === d.id);
      expect(events).toHaveLength(1);
      expect(events[0]).toMatchObject({ forYou: true, path, actor: { id: f.users.reviewer.id } });
    }
    // the outsider is no team member and is neither mentioned nor mailed
    expect((await mailFor(f.users.outsider.email)).filter((m) => m.subject.includes('Mentioned ladder'))).toEqual([]);
    // the design's author gets the comment event, not a mail
    const authorEvents = (await feed(f.users.designer)).filter((e) => e.design?.id === d.id && e.forYou);
    expect(authorEvents.map((e) => [e.kind, e.path])).toEqual([['comment', path]]);
    expect((await mailFor(f.users.designer.email)).filter((m) => m.subject.includes('Mentioned ladder'))).toEqual([]);
    // the other members see the mention in the team feed, not as theirs
    const viewerSees = (await feed(f.users.viewer)).filter((e) => e.design?.id === d.id);
    expect(viewerSees.map((e) => [e.kind, e.forYou]).sort()).toEqual([
      ['comment', false],
      ['mention', false],
    ]);
  });

  it('a reply mentions too, linking to its thread; a part anchor is named in words', async () => {
    const d = await create('Replied ladder');
    const top = await post(d.id, f.users.owner, { revision: 1, body: 'check the pump', anchor: { kind: 'part', blockId: 's2', part: 'pumpC' } });
    const reply = await post(d.id, f.users.designer, { revision: 1, body: 'asking @Ann Marie', anchor: onDesign, parentId: top.body.comment.id });
    expect(reply.body.comment.mentions.map((u) => u.id)).toEqual([annMarie.id]);
    await flushMail();
    const mail = (await mailFor(annMarie.email)).find((m) => m.subject === 'You were mentioned on "Replied ladder"');
    expect(mail).toBeDefined();
    expect(mail!.text).toContain(`${process.env.NEXTAUTH_URL}/designs/${d.id}?revision=1&comment=${top.body.comment.id}`);
    expect(mail!.text).toContain('on Stage 2 · pumping C');
  });

  it('a member who turned mention mail off gets the event but no mail; on a private design nobody else is told', async () => {
    const muted = await makeUser('Muted Person', freshEmail('muted'));
    await addMember(f.teamId, muted.id, 'reviewer');
    const settings = { review_requested: true, review_decided: true, mention: false, fork_offered: true, invitation: true };
    expect((await call(notifications.PUT, '/api/me/notifications', { method: 'PUT', as: muted, body: settings })).status).toBe(200);
    const d = await create('Quiet ladder');
    const res = await post(d.id, f.users.owner, { revision: 1, body: 'over to @Muted Person', anchor: onDesign });
    expect(res.body.comment.mentions.map((u) => u.id)).toEqual([muted.id]);
    await flushMail();
    expect(await mailFor(muted.email)).toEqual([]);
    const events = (await feed(muted)).filter((e) => e.kind === 'mention' && e.design?.id === d.id);
    expect(events.map((e) => [e.forYou, e.path])).toEqual([[true, `/designs/${d.id}?revision=1&comment=${res.body.comment.id}`]]);

    // a private design: the mention is stored, but a member who cannot read the design hears nothing
    const priv = await create('Hidden ladder', { visibility: 'private' });
    const p = await post(priv.id, f.users.designer, { revision: 1, body: 'remind @Ann Marie later', anchor: onDesign });
    expect(p.body.comment.mentions.map((u) => u.id)).toEqual([annMarie.id]);
    await flushMail();
    expect((await mailFor(annMarie.email)).filter((m) => m.subject.includes('Hidden ladder'))).toEqual([]);
    expect((await feed(annMarie)).filter((e) => e.design?.id === priv.id)).toEqual([]);
  });
});
