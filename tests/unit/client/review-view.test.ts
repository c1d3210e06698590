import { describe, expect, it } from 'vitest';
import type { ApprovalDto, DesignDetailDto, MemberDto, ReviewDto, Role } from '@/lib/api/contract';
import { approvalIsCurrent, compareHref, compareLinks, mayDecide, mayWithdraw, offerCompareHref, reviewerCandidates } from '@/lib/client/review-view';

const user = (id: string, name = id) => ({ id, name, email: `${id}@tallgrass.test` });
const member = (userId: string, role: Role, name: string): MemberDto => ({ userId, name, email: `${userId}@tallgrass.test`, role, joinedAt: '2026-01-01T00:00:00.000Z' });

function review(over: Partial<ReviewDto> & Pick<ReviewDto, 'id' | 'revision' | 'state' | 'createdAt'>): ReviewDto {
  return { designId: 'd1', requestedBy: user('dev'), reviewers: [user('rue')], note: '', decidedBy: null, decidedAt: null, decisionNote: null, ...over };
}

const perms = (decideReview: boolean): DesignDetailDto['permissions'] => ({
  edit: false, fork: false, share: false, archive: false, requestReview: false, decideReview, comment: true, offerBack: false,
});

describe('reviewerCandidates', () => {
  it('keeps reviewers and owners, drops designers, viewers and the author, sorted by name', () => {
    const members = [
      member('own', 'owner', 'Olive Owner'),
      member('dev', 'designer', 'Dev Designer'),
      member('rue', 'reviewer', 'Rue Reviewer'),
      member('vic', 'viewer', 'Vic Viewer'),
      member('ada', 'owner', 'Ada Author'),
    ];
    expect(reviewerCandidates(members, 'ada').map((m) => m.userId)).toEqual(['own', 'rue']);
    expect(reviewerCandidates(members, 'rue').map((m) => m.userId)).toEqual(['ada', 'own']);
  });
});

describe('mayDecide / mayWithdraw', () => {
  const open = review({ id: 'r1', revision: 2, state: 'open', createdAt: '2026-01-02T00:00:00.000Z', requestedBy: user('dev'), reviewers: [user('rue')] });
  const design = { permissions: perms(true), openReview: open, author: user('ada') };

  it('lets an asked reviewer and an owner decide, not another reviewer nor anyone the server refuses', () => {
    expect(mayDecide(design, 'rue', 'reviewer')).toBe(true);
    expect(mayDecide(design, 'own', 'owner')).toBe(true);
    expect(mayDecide(design, 'ray', 'reviewer')).toBe(false);
    expect(mayDecide({ ...design, permissions: perms(false) }, 'rue', 'reviewer')).toBe(false);
    expect(mayDecide({ ...design, openReview: null }, 'rue', 'reviewer')).toBe(false);
  });

  it('lets the requester, the author (as designers) and any owner withdraw', () => {
    expect(mayWithdraw(design, 'dev', 'designer')).toBe(true);
    expect(mayWithdraw(design, 'ada', 'designer')).toBe(true);
    expect(mayWithdraw(design, 'own', 'owner')).toBe(true);
    expect(mayWithdraw(design, 'bo', 'designer')).toBe(false);
    expect(mayWithdraw(design, 'rue', 'reviewer')).toBe(false);
    expect(mayWithdraw(design, 'dev', 'viewer')).toBe(false);
    expect(mayWithdraw({ ...design, openReview: null }, 'own', 'owner')).toBe(false);
  });
});

describe('compare links', () => {
  it('builds the compare paths, with the fork and offer for an offer', () => {
    expect(compareHref('d1', 1, 2)).toBe('/designs/d1/compare?a=1&b=2');
    const offer = { id: 'o1', fork: { designId: 'f1', title: 'F', revision: 4 }, parent: { designId: 'p1', title: 'P', baseRevision: 2 } };
    expect(offerCompareHref(offer, 3)).toBe('/designs/p1/compare?a=3&b=4&bDesign=f1&offer=o1');
  });

  it('a re-request after changes offers the revision changes were asked on against the one asked now', () => {
    const reviews = [
      review({ id: 'r2', revision: 2, state: 'open', createdAt: '2026-01-03T00:00:00.000Z' }),
      review({ id: 'r1', revision: 1, state: 'changes_requested', createdAt: '2026-01-01T00:00:00.000Z', decidedBy: user('rue'), decidedAt: '2026-01-02T00:00:00.000Z' }),
    ];
    const links = compareLinks('d1', 2, reviews, null);
    // The pair (1, 2) is both the re-request and the reviewed-vs-latest link: listed once.
    expect(links.map((l) => [l.a, l.b])).toEqual([[1, 2]]);
    expect(links[0].href).toBe('/designs/d1/compare?a=1&b=2');
    expect(links[0].label).toContain('changes asked');
  });

  it('after an approval and newer saves, compares the approved revision with the latest; nothing when nothing moved', () => {
    const approved = review({ id: 'r1', revision: 2, state: 'approved', createdAt: '2026-01-01T00:00:00.000Z', decidedBy: user('rue'), decidedAt: '2026-01-02T00:00:00.000Z' });
    const approval: ApprovalDto = { reviewId: 'r1', revision: 2, approvedBy: user('rue'), approvedAt: '2026-01-02T00:00:00.000Z', note: '' };
    expect(compareLinks('d1', 4, [approved], approval).map((l) => [l.a, l.b, l.label])).toEqual([[2, 4, 'Compare the approved r2 with the latest r4']]);
    expect(compareLinks('d1', 2, [approved], approval)).toEqual([]);
    expect(compareLinks('d1', 3, [], null)).toEqual([]);
    expect(approvalIsCurrent(approval, 2)).toBe(true);
    expect(approvalIsCurrent(approval, 4)).toBe(false);
    expect(approvalIsCurrent(null, 1)).toBe(false);
  });

  it('lists the newer decided review first, then an older approval, each once', () => {
    const approval: ApprovalDto = { reviewId: 'r1', revision: 1, approvedBy: user('rue'), approvedAt: '2026-01-02T00:00:00.000Z', note: '' };
    const reviews = [
      review({ id: 'r3', revision: 3, state: 'changes_requested', createdAt: '2026-01-05T00:00:00.000Z', decidedBy: user('rue'), decidedAt: '2026-01-06T00:00:00.000Z' }),
      review({ id: 'r1', revision: 1, state: 'approved', createdAt: '2026-01-01T00:00:00.000Z', decidedBy: user('rue'), decidedAt: '2026-01-02T00:00:00.000Z' }),
    ];
    expect(compareLinks('d1', 4, reviews, approval).map((l) => [l.a, l.b])).toEqual([[3, 4], [1, 4]]);
  });
});
