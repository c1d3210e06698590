/**
 * What the review and lineage panels show, decided from the DTOs the server sent: who can be
 * asked to review, whether the caller sees the decide and withdraw buttons, and which compare
 * links make sense. The server enforces every rule again; these only keep the UI from offering
 * an action that would be refused.
 */
import type { ApprovalDto, DesignDetailDto, MemberDto, OfferDto, ReviewDto, Role } from '@/lib/api/contract';

/** Roles that may decide a review (mirrors the server's deciders). */
const DECIDER_ROLES: readonly Role[] = ['reviewer', 'owner'];

/** Members who may be asked to review: reviewers and owners, never the design's author; by name. */
export function reviewerCandidates(members: readonly MemberDto[], authorId: string): MemberDto[] {
  return members
    .filter((m) => DECIDER_ROLES.includes(m.role) && m.userId !== authorId)
    .sort((a, b) => (a.name || a.email).localeCompare(b.name || b.email));
}

/**
 * The caller sees Approve / Ask for changes on the open review: the server lets them decide
 * (reviewer or owner, not the author) and they are one of the reviewers asked, or an owner.
 */
export function mayDecide(design: Pick<DesignDetailDto, 'permissions' | 'openReview'>, userId: string, role: Role | undefined): boolean {
  const open = design.openReview;
  if (!open || open.state !== 'open' || !design.permissions.decideReview) return false;
  return role === 'owner' || open.reviewers.some((u) => u.id === userId);
}

/** The caller sees Withdraw: an owner, or an owner/designer who asked for the review or wrote the design. */
export function mayWithdraw(design: Pick<DesignDetailDto, 'author' | 'openReview'>, userId: string, role: Role | undefined): boolean {
  const open = design.openReview;
  if (!open || open.state !== 'open') return false;
  if (role === 'owner') return true;
  if (role !== 'designer') return false;
  return open.requestedBy.id === userId || design.author.id === userId;
}

/** App path of the compare page for two revisions of one design. */
export function compareHref(designId: string, a: number, b: number): string {
  return `/designs/${encodeURIComponent(designId)}/compare?a=${a}&b=${b}`;
}

/** App path of the compare page for an offer: the parent's latest against the fork's offered revision. */
export function offerCompareHref(offer: Pick<OfferDto, 'id' | 'fork' | 'parent'>, parentLatestRevision: number): string {
  const q = new URLSearchParams({ a: String(parentLatestRevision), b: String(offer.fork.revision), bDesign: offer.fork.designId, offer: offer.id });
  return `/designs/${encodeURIComponent(offer.parent.designId)}/compare?${q.toString()}`;
}

export interface CompareLink {
  a: number;
  b: number;
  label: string;
  href: string;
}

/**
 * Compare links for the review panel, most useful first, no pair twice:
 * - the open request follows a "changes asked" decision on an older revision: that revision
 *   against the one now asked for (what changed in answer to the review);
 * - the last decided request's revision, then the approved one, against the latest, when the
 *   design has moved on since.
 * `reviews` is the history, newest first, as the server sends it.
 */
export function compareLinks(designId: string, latestRevision: number, reviews: readonly ReviewDto[], approval: ApprovalDto | null): CompareLink[] {
  const links: CompareLink[] = [];
  const add = (a: number, b: number, label: string) => {
    if (a >= b || links.some((l) => l.a === a && l.b === b)) return;
    links.push({ a, b, label, href: compareHref(designId, a, b) });
  };
  const open = reviews.find((r) => r.state === 'open');
  if (open) {
    const openAt = Date.parse(open.createdAt);
    const asked = reviews.find((r) => r.state === 'changes_requested' && r.revision < open.revision && Date.parse(r.createdAt) <= openAt);
    if (asked) add(asked.revision, open.revision, `Compare r${asked.revision} (changes asked) with r${open.revision} (asked now)`);
  }
  const decided = reviews.find((r) => r.state === 'approved' || r.state === 'changes_requested');
  if (decided) add(decided.revision, latestRevision, `Compare the ${decided.state === 'approved' ? 'approved' : 'reviewed'} r${decided.revision} with the latest r${latestRevision}`);
  if (approval) add(approval.revision, latestRevision, `Compare the approved r${approval.revision} with the latest r${latestRevision}`);
  return links;
}

/** The latest revision is the one an approval names: nothing saved since. */
export function approvalIsCurrent(approval: ApprovalDto | null, latestRevision: number): boolean {
  return approval !== null && approval.revision === latestRevision;
}
