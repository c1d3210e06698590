/**
 * Offers back: a fork's author offers one revision of the fork to the design it was forked
 * from. Nothing changes in the parent until someone who decides for it accepts, after comparing
 * the offered revision against the parent's latest; the fork's document then becomes the
 * parent's next revision through the same conditional claim a save takes (`appendRevision`),
 * authored by the offerer.
 *
 * Who may do what:
 * - offer: the fork's author while owner or designer in the fork's team (403 otherwise), on a
 *   fork that is shared with its team and not archived, whose parent they can still open and
 *   that is not archived (409 otherwise: the fork's detail already names the parent, so this
 *   leaks nothing), and that someone who decides for the parent can open (409). One open offer
 *   per fork: a second answers 409 until the first is withdrawn or decided.
 * - decide (accept/decline): the parent's author while owner or designer in its team, or any
 *   owner of the parent's team, who can open both designs. A fork author who is neither cannot
 *   accept their own offer; one who is could save to the parent directly anyway. Accepting names
 *   the parent revision compared against; if the parent has moved on, 409 with latestRevision and
 *   nothing is written.
 * - withdraw: the offerer alone, while the offer is open.
 * Callers who can open neither design get 404 for the offer, as for an unknown id.
 *
 * Each change runs in one transaction holding the offer's row lock (and, on offer and accept,
 * the fork's or parent's row lock) so concurrent requests see one order. Activity: 'fork_offered'
 * (with mail) to the parent's author and the parent team's owners; 'offer_decided' (feed only)
 * to the offerer.
 */
import 'server-only';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import type { OfferDto, RevisionSummaryDto, offerBackSchema, offerDecisionSchema } from '../api/contract';
import { designDocumentSchema } from '../circuit/document/schema';
import { db } from '../db';
import { conflict, forbidden, invalid, notFound } from '../errors';
import type { Design, ForkOffer } from '../../models';
import { canWrite, loadCaller, requireRole, WRITER_ROLES, type Caller } from './access';
import { recordActivity } from './activity';
import { recordAudit } from './audit';
import { appendRevision, loadReadable, readable } from './designs';
import { revisionSummaryDto, userDto } from './dto';

type OfferInput = z.output<typeof offerBackSchema>;
type DecisionInput = z.output<typeof offerDecisionSchema>;

/** Title shown for a design the caller cannot open. */
const HIDDEN = 'a design you cannot see';

type DesignRef = Pick<Design, 'id' | 'title' | 'teamId' | 'visibility' | 'authorId' | 'archivedAt' | 'latestRevision'>;
const DESIGN_ATTRIBUTES = ['id', 'title', 'teamId', 'visibility', 'authorId', 'archivedAt', 'latestRevision'];

const includeForOffer = () => {
  const { User, Design: D } = db().models;
  return [
    { model: User, as: 'offeredBy' },
    { model: User, as: 'decidedBy' },
    { model: D, as: 'fork', attributes: DESIGN_ATTRIBUTES },
    { model: D, as: 'parent', attributes: DESIGN_ATTRIBUTES },
  ];
};

/**
 * App path of the compare page for an offer: the parent's revision `parentRevision` (a) against
 * the fork's offered revision (b).
 */
export function offerComparePath(o: Pick<ForkOffer, 'id' | 'parentDesignId' | 'forkDesignId' | 'forkRevision'>, parentRevision: number): string {
  return `/designs/${o.parentDesignId}/compare?a=${parentRevision}&b=${o.forkRevision}&bDesign=${o.forkDesignId}&offer=${o.id}`;
}

/** May `caller` decide offers to `parent`? Its author while owner/designer, or any owner; both readable. */
function mayDecide(caller: Caller, parent: DesignRef): boolean {
  if (!readable(caller, parent)) return false;
  const role = caller.roles.get(parent.teamId);
  return role === 'owner' || (canWrite(role) && parent.authorId === caller.userId);
}

/** An offer with offeredBy, decidedBy, fork and parent included, as `caller` sees it. */
export function offerDto(caller: Caller, o: ForkOffer): OfferDto {
  const fork = o.fork;
  const parent = o.parent;
  const seesFork = !!fork && readable(caller, fork);
  return {
    id: o.id,
    fork: { designId: o.forkDesignId, title: seesFork ? fork.title : HIDDEN, revision: o.forkRevision },
    parent: { designId: o.parentDesignId, title: parent && readable(caller, parent) ? parent.title : HIDDEN, baseRevision: o.parentBaseRevision },
    offeredBy: userDto(o.offeredBy),
    message: o.message,
    state: o.state,
    createdAt: o.createdAt.toISOString(),
    decidedBy: o.decidedById ? userDto(o.decidedBy) : null,
    decidedAt: o.decidedAt ? o.decidedAt.toISOString() : null,
    decisionNote: o.decisionNote ?? null,
    resultingRevision: o.resultingRevision ?? null,
    canDecide: o.state === 'open' && seesFork && !!parent && mayDecide(caller, parent),
  };
}

async function loadOffer(offerId: string, transaction?: Transaction): Promise<ForkOffer | null> {
  return db().models.ForkOffer.findByPk(offerId, { include: includeForOffer(), transaction });
}

/** The offer with its designs; 404 when unknown or when the caller can open neither design. */
async function loadVisibleOffer(caller: Caller, offerId: string): Promise<ForkOffer> {
  const o = await loadOffer(offerId);
  if (!o || !((o.fork && readable(caller, o.fork)) || (o.parent && readable(caller, o.parent)))) throw notFound('offer');
  return o;
}

/** Lock a design row for the rest of `transaction` and read it fresh. */
async function lockDesign(designId: string, transaction: Transaction): Promise<Design> {
  const d = await db().models.Design.findByPk(designId, { lock: transaction.LOCK.UPDATE, transaction });
  if (!d) throw notFound('design');
  return d;
}

/**
 * The people an offer to `parent` is for — its author and its team's owners — each with their
 * memberships, and whether they may decide it. Only those who can open both designs count: the
 * mail's link would show anyone else a 404.
 */
async function audience(parent: DesignRef, fork: DesignRef): Promise<{ userId: string; decides: boolean }[]> {
  const { Membership } = db().models;
  const owners = await Membership.findAll({ where: { teamId: parent.teamId, role: 'owner' }, attributes: ['userId'] });
  const ids = [...new Set([parent.authorId, ...owners.map((m) => m.userId)])];
  const rows = await Membership.findAll({ where: { userId: ids }, attributes: ['userId', 'teamId', 'role'] });
  return ids
    .map((userId) => ({ userId, roles: new Map(rows.filter((m) => m.userId === userId).map((m) => [m.teamId, m.role])) }))
    .filter((c) => readable(c, parent) && readable(c, fork))
    .map((c) => ({ userId: c.userId, decides: mayDecide(c, parent) }));
}

/**
 * Offer revision `input.revision` (default the latest) of fork `forkId` back to its parent.
 * The parent's latest revision at this moment is recorded as the offer's base.
 */
export async function createOffer(userId: string, forkId: string, input: OfferInput): Promise<{ offer: OfferDto }> {
  const caller = await loadCaller(userId);
  const fork = await loadReadable(caller, forkId);
  requireRole(caller, fork.teamId, WRITER_ROLES, 'design');
  if (fork.authorId !== userId) throw forbidden('only the fork\u2019s author can offer it back');
  if (!fork.forkedFromDesignId) throw conflict('this design is not a fork; there is no design to offer it back to');
  const { sequelize, models } = db();
  const parent = await models.Design.findByPk(fork.forkedFromDesignId);
  if (!parent || !readable(caller, parent)) throw conflict('you can no longer open the design this was forked from, so you cannot offer it back');
  if (fork.archivedAt) throw conflict('this fork is archived; restore it before offering it back');
  if (parent.archivedAt) throw conflict(`"${parent.title}" is archived; it takes no new revisions`);
  if (fork.visibility === 'private') throw conflict('share the fork with its team first: the people who decide for the parent could not open it');
  const revision = input.revision ?? fork.latestRevision;
  if (revision > fork.latestRevision) throw invalid(`revision ${revision} does not exist (the latest is ${fork.latestRevision})`, 'revision');
  const people = await audience(parent, fork);
  if (!people.some((p) => p.decides)) throw conflict(`nobody who decides for "${parent.title}" can open this fork; it needs to be in a team they belong to`);
  const actor = userDto(await models.User.findByPk(userId)).name;

  const offerId = await sequelize.transaction(async (transaction) => {
    await lockDesign(fork.id, transaction);
    const open = await models.ForkOffer.findOne({ where: { forkDesignId: fork.id, state: 'open' }, transaction });
    if (open) throw conflict(`revision ${open.forkRevision} of this fork is already offered back; withdraw that offer before offering another`);
    const current = await models.Design.findByPk(parent.id, { transaction });
    if (!current) throw conflict('the design this was forked from no longer exists');
    if (current.archivedAt) throw conflict(`"${parent.title}" is archived; it takes no new revisions`);
    const offer = await models.ForkOffer.create(
      { forkDesignId: fork.id, forkRevision: revision, parentDesignId: parent.id, parentBaseRevision: current.latestRevision, offeredById: userId, message: input.message ?? '' },
      { transaction },
    );
    await recordActivity(
      {
        kind: 'fork_offered',
        teamId: parent.teamId,
        designId: parent.id,
        actorId: userId,
        summary: `${actor} offered "${fork.title}" r${revision} back to "${parent.title}"`,
        path: offerComparePath(offer, current.latestRevision),
        recipients: people.map((p) => p.userId),
        mail: {
          kind: 'fork_offered',
          subject: `Offered back to "${parent.title}": "${fork.title}" r${revision}`,
          lines: [
            `${actor} offered revision ${revision} of their fork "${fork.title}" back to "${parent.title}".`,
            ...(input.message ? [`Message: ${input.message}`] : []),
            `Compare it with "${parent.title}" r${current.latestRevision}, then accept or decline. Nothing changes in "${parent.title}" until the offer is accepted.`,
            'Accepting adds a revision; it is not a review or an approval, and it does not certify that the supply is safe.',
          ],
          button: 'Compare the offer',
        },
      },
      transaction,
    );
    return offer.id;
  });
  return { offer: offerDto(caller, (await loadOffer(offerId)) as ForkOffer) };
}

/** Offers to a design (incoming, as parent) and from it (outgoing, as fork), newest first (any reader). */
export async function listOffers(userId: string, designId: string): Promise<{ incoming: OfferDto[]; outgoing: OfferDto[] }> {
  const caller = await loadCaller(userId);
  await loadReadable(caller, designId);
  const { ForkOffer: O } = db().models;
  const order: [string, string][] = [['createdAt', 'DESC'], ['id', 'DESC']];
  const [incoming, outgoing] = await Promise.all([
    O.findAll({ where: { parentDesignId: designId }, include: includeForOffer(), order }),
    O.findAll({ where: { forkDesignId: designId }, include: includeForOffer(), order }),
  ]);
  return { incoming: incoming.map((o) => offerDto(caller, o)), outgoing: outgoing.map((o) => offerDto(caller, o)) };
}

/**
 * Accept or decline an open offer. Accepting writes the fork revision's document as the parent's
 * next revision on top of `input.parentBaseRevision`, which must be the parent's latest.
 */
export async function decideOffer(userId: string, offerId: string, input: DecisionInput): Promise<{ offer: OfferDto; revision: RevisionSummaryDto | null }> {
  const caller = await loadCaller(userId);
  const existing = await loadOffer(offerId);
  if (!existing || !existing.parent || !existing.fork || !readable(caller, existing.parent) || !readable(caller, existing.fork)) throw notFound('offer');
  const parent = existing.parent;
  const fork = existing.fork;
  if (!mayDecide(caller, parent)) throw forbidden(`only the author of "${parent.title}" or an owner of its team can accept or decline offers to it`);
  const { sequelize, models } = db();
  const decider = userDto(await models.User.findByPk(userId)).name;
  const offerer = userDto(existing.offeredBy).name;
  const accept = input.decision === 'accept';

  const created = await sequelize.transaction(async (transaction) => {
    const offer = await models.ForkOffer.findByPk(offerId, { lock: transaction.LOCK.UPDATE, transaction });
    if (!offer) throw notFound('offer');
    if (offer.state !== 'open') throw conflict(`this offer is ${offer.state}; only an open offer can be accepted or declined`);
    let revision = null;
    if (accept) {
      const base = input.parentBaseRevision as number;
      const locked = await lockDesign(parent.id, transaction);
      if (locked.archivedAt) throw conflict(`"${parent.title}" is archived; restore it before accepting an offer`);
      if (locked.latestRevision !== base) {
        throw conflict(`"${parent.title}" is at r${locked.latestRevision}, not r${base}; compare the offer against the latest revision first`, { latestRevision: locked.latestRevision });
      }
      const source = await models.DesignRevision.findOne({ where: { designId: offer.forkDesignId, number: offer.forkRevision }, transaction });
      if (!source) throw notFound('revision');
      const document = designDocumentSchema.parse(source.document);
      const message = `Offered back from "${fork.title}" r${offer.forkRevision} by ${offerer}; accepted by ${decider}`.slice(0, 500);
      revision = await appendRevision(parent.id, base, document, offer.offeredById, message, transaction);
    }
    await offer.update(
      { state: accept ? 'accepted' : 'declined', decidedById: userId, decidedAt: new Date(), decisionNote: input.note ?? '', resultingRevision: revision ? revision.number : null },
      { transaction },
    );
    await recordAudit(
      {
        teamId: parent.teamId,
        actorId: userId,
        action: accept ? 'offer.accepted' : 'offer.declined',
        targetType: 'offer',
        targetId: offer.id,
        summary: { designId: parent.id, forkDesignId: offer.forkDesignId, forkRevision: offer.forkRevision, resultingRevision: revision ? revision.number : null },
      },
      transaction,
    );
    const what = accept
      ? `accepted "${fork.title}" r${offer.forkRevision} into "${parent.title}" as r${revision?.number}`
      : `declined "${fork.title}" r${offer.forkRevision} offered to "${parent.title}"`;
    await recordActivity(
      {
        kind: 'offer_decided',
        teamId: parent.teamId,
        designId: parent.id,
        actorId: userId,
        summary: `${decider} ${what}`,
        path: revision ? `/designs/${parent.id}?revision=${revision.number}` : `/designs/${offer.forkDesignId}?revision=${offer.forkRevision}`,
        recipients: [offer.offeredById],
      },
      transaction,
    );
    return revision;
  });
  return { offer: offerDto(caller, (await loadOffer(offerId)) as ForkOffer), revision: created ? revisionSummaryDto(created) : null };
}

/** Withdraw an open offer (its offerer alone). */
export async function withdrawOffer(userId: string, offerId: string): Promise<{ offer: OfferDto }> {
  const caller = await loadCaller(userId);
  const existing = await loadVisibleOffer(caller, offerId);
  if (existing.offeredById !== userId) throw forbidden('only the person who offered it can withdraw an offer');
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const offer = await models.ForkOffer.findByPk(offerId, { lock: transaction.LOCK.UPDATE, transaction });
    if (!offer) throw notFound('offer');
    if (offer.state !== 'open') throw conflict(`this offer is ${offer.state}; only an open offer can be withdrawn`);
    await offer.update({ state: 'withdrawn' }, { transaction });
  });
  return { offer: offerDto(caller, (await loadOffer(offerId)) as ForkOffer) };
}
