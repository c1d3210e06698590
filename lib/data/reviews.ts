/**
 * Review requests and approvals.
 *
 * Owners and designers ask team members with the reviewer or owner role (never the design's
 * author) to review one revision; a new request supersedes the open one. Reviewers and owners
 * who did not author the design approve or ask for changes; the approval is an immutable row
 * naming who approved which revision, when. Status moves draft/changes_requested/
 * changed_since_approval → in_review → approved | changes_requested; an approval of an older
 * revision than the latest leaves the design 'changed_since_approval'. Every change runs in one
 * transaction holding the design row's lock, the same lock a save takes, so a decision and a
 * concurrent save see one order.
 *
 * An approval records a colleague's review; it never claims the supply is safe.
 */
import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import type { ApprovalDto, DesignDetailDto, DesignStatus, ReviewDto, reviewDecisionSchema, requestReviewSchema } from '../api/contract';
import { db } from '../db';
import { conflict, forbidden, invalid, notFound } from '../errors';
import type { Design, ReviewRequest } from '../../models';
import { canWrite, loadCaller, requireMember, requireRole, WRITER_ROLES, type Caller } from './access';
import { recordActivity } from './activity';
import { recordAudit } from './audit';
import { DECIDER_ROLES, detailDto, includeForReview, latestApproval, loadReadable } from './designs';
import { approvalDto, reviewDto, userDto } from './dto';

type RequestInput = z.output<typeof requestReviewSchema>;
type DecisionInput = z.output<typeof reviewDecisionSchema>;

/** The one line every review mail ends with. */
const CAUTION = 'An approval records a colleague\u2019s review of the design; it does not certify that the supply is safe. Follow local codes and licensed practice.';

/** App path of a review: the design at the reviewed revision, the review panel focused. */
export function reviewPath(designId: string, revision: number, reviewId: string): string {
  return `/designs/${designId}?revision=${revision}&review=${reviewId}`;
}

async function loadReview(designId: string, reviewId: string, transaction?: Transaction): Promise<ReviewRequest> {
  const r = await db().models.ReviewRequest.findOne({ where: { id: reviewId, designId }, include: includeForReview(), transaction });
  if (!r) throw notFound('review');
  return r;
}

/** Lock the design row for the rest of `transaction` and read it fresh. */
async function lockDesign(designId: string, transaction: Transaction): Promise<Design> {
  const d = await db().models.Design.findByPk(designId, { lock: transaction.LOCK.UPDATE, transaction });
  if (!d) throw notFound('design');
  return d;
}

/** The status a design returns to when no review is open: from its latest approval, else draft. */
async function statusWithoutOpenReview(d: Design, transaction: Transaction): Promise<DesignStatus> {
  const approval = await latestApproval(d.id, transaction);
  if (!approval) return 'draft';
  return approval.revision === d.latestRevision ? 'approved' : 'changed_since_approval';
}

async function setStatus(designId: string, status: DesignStatus, transaction: Transaction): Promise<void> {
  await db().models.Design.update({ status }, { where: { id: designId }, transaction });
}

async function answer(caller: Caller, designId: string, reviewId: string): Promise<{ review: ReviewDto; design: DesignDetailDto }> {
  const [review, d] = await Promise.all([loadReview(designId, reviewId), loadReadable(caller, designId)]);
  return { review: reviewDto(review), design: await detailDto(caller, d) };
}

/**
 * Ask for a review of `input.revision` (owners and designers). Reviewers must be members of the
 * design's team with the reviewer or owner role and not its author (422 on reviewerIds). A
 * private design is refused (409): the reviewers could not open it.
 */
export async function requestReview(userId: string, designId: string, input: RequestInput): Promise<{ review: ReviewDto; design: DesignDetailDto }> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  requireRole(caller, d.teamId, WRITER_ROLES, 'design');
  if (d.archivedAt) throw conflict('this design is archived; restore it before asking for a review');
  if (d.visibility === 'private') throw conflict('share the design with the team first: reviewers cannot open a private design');
  if (input.revision > d.latestRevision) throw invalid(`revision ${input.revision} does not exist (the latest is ${d.latestRevision})`, 'revision');

  const { sequelize, models } = db();
  const reviewerIds = [...new Set(input.reviewerIds)];
  const members = await models.Membership.findAll({ where: { teamId: d.teamId, userId: reviewerIds }, include: [{ model: models.User, as: 'user' }] });
  for (const id of reviewerIds) {
    const m = members.find((x) => x.userId === id);
    if (!m) throw invalid('every reviewer must be a member of the design\u2019s team', 'reviewerIds');
    if (m.userId === d.authorId) throw invalid(`${userDto(m.user).name} wrote this design and cannot review it`, 'reviewerIds');
    if (!DECIDER_ROLES.includes(m.role)) throw invalid(`${userDto(m.user).name} is a ${m.role}; reviewers need the reviewer or owner role`, 'reviewerIds');
  }
  const requester = await models.User.findByPk(userId);
  const actor = userDto(requester).name;

  const reviewId = await sequelize.transaction(async (transaction) => {
    const locked = await lockDesign(designId, transaction);
    if (locked.archivedAt) throw conflict('this design is archived; restore it before asking for a review');
    await models.ReviewRequest.update({ state: 'superseded' }, { where: { designId, state: 'open' }, transaction });
    const review = await models.ReviewRequest.create({ designId, revision: input.revision, requestedById: userId, note: input.note ?? '' }, { transaction });
    await models.ReviewRequestReviewer.bulkCreate(
      reviewerIds.map((id) => ({ reviewRequestId: review.id, userId: id })),
      { transaction },
    );
    await setStatus(designId, 'in_review', transaction);
    await recordAudit({ teamId: d.teamId, actorId: userId, action: 'review.requested', targetType: 'review', targetId: review.id, summary: { designId, revision: input.revision, reviewers: reviewerIds.length } }, transaction);
    const path = reviewPath(designId, input.revision, review.id);
    await recordActivity(
      {
        kind: 'review_requested',
        teamId: d.teamId,
        designId,
        actorId: userId,
        summary: `${actor} asked for a review of "${d.title}" r${input.revision}`,
        path,
        recipients: reviewerIds,
        mail: {
          kind: 'review_requested',
          subject: `Review requested: "${d.title}" r${input.revision}`,
          lines: [
            `${actor} asked you to review revision ${input.revision} of "${d.title}".`,
            ...(input.note ? [`Note: ${input.note}`] : []),
            CAUTION,
          ],
        },
      },
      transaction,
    );
    return review.id;
  });
  return answer(caller, designId, reviewId);
}

/** A design's review requests, newest first, and its latest approval (any reader). */
export async function listReviews(userId: string, designId: string): Promise<{ reviews: ReviewDto[]; approval: ApprovalDto | null }> {
  const caller = await loadCaller(userId);
  await loadReadable(caller, designId);
  const [rows, approval] = await Promise.all([
    db().models.ReviewRequest.findAll({ where: { designId }, include: includeForReview(), order: [['createdAt', 'DESC']] }),
    latestApproval(designId),
  ]);
  return { reviews: rows.map(reviewDto), approval: approval ? approvalDto(approval) : null };
}

/**
 * Approve or ask for changes on an open request (reviewers and owners; never the design's
 * author, 403). A request that is no longer open answers 409.
 */
export async function decideReview(userId: string, designId: string, reviewId: string, input: DecisionInput): Promise<{ review: ReviewDto; design: DesignDetailDto }> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  requireRole(caller, d.teamId, DECIDER_ROLES, 'design');
  if (d.authorId === userId) throw forbidden(input.decision === 'approve' ? 'you cannot approve your own design' : 'you cannot review your own design');
  await loadReview(designId, reviewId);
  const { sequelize, models } = db();
  const decider = userDto(await models.User.findByPk(userId)).name;
  await sequelize.transaction(async (transaction) => {
    const locked = await lockDesign(designId, transaction);
    if (locked.archivedAt) throw conflict('this design is archived; restore it before deciding a review');
    const review = await models.ReviewRequest.findOne({ where: { id: reviewId, designId }, lock: transaction.LOCK.UPDATE, transaction });
    if (!review) throw notFound('review');
    if (review.state !== 'open') throw conflict(`this review request is ${review.state.replace('_', ' ')}; only an open request can be decided`);
    const approve = input.decision === 'approve';
    await review.update({ state: approve ? 'approved' : 'changes_requested', decidedById: userId, decidedAt: new Date(), decisionNote: input.note ?? '' }, { transaction });
    if (approve) {
      await models.Approval.create({ designId, reviewRequestId: review.id, revision: review.revision, approvedById: userId, note: input.note ?? '' }, { transaction });
    }
    await setStatus(designId, approve ? (locked.latestRevision === review.revision ? 'approved' : 'changed_since_approval') : 'changes_requested', transaction);
    await recordAudit(
      { teamId: d.teamId, actorId: userId, action: approve ? 'review.approved' : 'review.changes_requested', targetType: 'review', targetId: review.id, summary: { designId, revision: review.revision } },
      transaction,
    );
    const what = approve ? `approved "${d.title}" r${review.revision}` : `asked for changes to "${d.title}" r${review.revision}`;
    await recordActivity(
      {
        kind: 'review_decided',
        teamId: d.teamId,
        designId,
        actorId: userId,
        summary: `${decider} ${what}`,
        path: reviewPath(designId, review.revision, review.id),
        recipients: [...new Set([review.requestedById, d.authorId])],
        mail: {
          kind: 'review_decided',
          subject: approve ? `Approved: "${d.title}" r${review.revision}` : `Changes requested: "${d.title}" r${review.revision}`,
          lines: [`${decider} ${what}.`, ...(input.note ? [`Note: ${input.note}`] : []), CAUTION],
        },
      },
      transaction,
    );
  });
  return answer(caller, designId, reviewId);
}

/**
 * Withdraw an open request (its requester or the design's author while they are owner or
 * designer, or any owner). The status goes back to what the latest approval says, else draft.
 */
export async function withdrawReview(userId: string, designId: string, reviewId: string): Promise<{ review: ReviewDto; design: DesignDetailDto }> {
  const caller = await loadCaller(userId);
  const d = await loadReadable(caller, designId);
  const role = requireMember(caller, d.teamId, 'design');
  const existing = await loadReview(designId, reviewId);
  const mine = existing.requestedById === userId || d.authorId === userId;
  if (!(role === 'owner' || (canWrite(role) && mine))) throw forbidden('only the requester, the design\u2019s author or an owner can withdraw a review request');
  const { sequelize, models } = db();
  const actor = userDto(await models.User.findByPk(userId)).name;
  await sequelize.transaction(async (transaction) => {
    const locked = await lockDesign(designId, transaction);
    const review = await models.ReviewRequest.findOne({ where: { id: reviewId, designId }, lock: transaction.LOCK.UPDATE, transaction });
    if (!review) throw notFound('review');
    if (review.state !== 'open') throw conflict(`this review request is ${review.state.replace('_', ' ')}; only an open request can be withdrawn`);
    await review.update({ state: 'withdrawn' }, { transaction });
    await setStatus(designId, await statusWithoutOpenReview(locked, transaction), transaction);
    await recordAudit({ teamId: d.teamId, actorId: userId, action: 'review.withdrawn', targetType: 'review', targetId: review.id, summary: { designId, revision: review.revision } }, transaction);
    const reviewerIds = (existing.reviewers ?? []).map((u) => u.id);
    await recordActivity(
      {
        kind: 'review_withdrawn',
        teamId: d.teamId,
        designId,
        actorId: userId,
        summary: `${actor} withdrew the review request for "${d.title}" r${review.revision}`,
        path: reviewPath(designId, review.revision, review.id),
        recipients: reviewerIds,
      },
      transaction,
    );
  });
  return answer(caller, designId, reviewId);
}
