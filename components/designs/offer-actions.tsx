'use client';

import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { Badge, Notice, Skeleton } from '@/components/ui/notice';
import type { OfferDto } from '@/lib/api/contract';
import { ApiError, api, fieldError, formError } from '@/lib/client/api';
import { formatDateTime, offerStateLabel, personName } from '@/lib/client/format';
import { keys } from '@/lib/client/hooks';
import { offerCompareHref } from '@/lib/client/review-view';

const offersKey = (designId: string) => [...keys.design(designId), 'offers'] as const;

/** Offers back to this design (incoming) and from it to its parent (outgoing). */
export function useOffers(designId: string) {
  return useQuery({
    queryKey: offersKey(designId),
    queryFn: ({ signal }) => api('GET /api/designs/:designId/offers', { params: { designId }, signal }),
  });
}

/** After an offer changes: both designs (revisions, lineage, offers), their team lists and the feed. */
function useRefreshAfterOffer() {
  const qc = useQueryClient();
  return (offer: OfferDto) =>
    Promise.all([
      qc.invalidateQueries({ queryKey: keys.design(offer.parent.designId) }),
      qc.invalidateQueries({ queryKey: keys.design(offer.fork.designId) }),
      qc.invalidateQueries({ queryKey: ['teams'] }),
      qc.invalidateQueries({ queryKey: ['activity'] }),
    ]);
}

/** The fork's author offers its latest revision back to the parent. */
export function useOfferBack(designId: string) {
  const refresh = useRefreshAfterOffer();
  return useMutation({
    mutationFn: (body: { revision?: number; message?: string }) => api('POST /api/designs/:designId/offers', { params: { designId }, body }),
    onSuccess: (res) => refresh(res.offer),
  });
}

/** The one who offered takes an open offer back. */
export function useWithdrawOffer() {
  const refresh = useRefreshAfterOffer();
  return useMutation({
    mutationFn: (offerId: string) => api('DELETE /api/offers/:offerId', { params: { offerId } }),
    onSuccess: (res) => refresh(res.offer),
  });
}

function useDecideOffer(offerId: string) {
  const refresh = useRefreshAfterOffer();
  return useMutation({
    mutationFn: (body: { decision: 'accept' | 'decline'; parentBaseRevision?: number; note?: string }) =>
      api('POST /api/offers/:offerId/decision', { params: { offerId }, body }),
    onSuccess: (res) => refresh(res.offer),
  });
}

function DeclineForm({ offerId, onDone }: { offerId: string; onDone: () => void }) {
  const decide = useDecideOffer(offerId);
  const [note, setNote] = useState('');
  const noteError = fieldError(decide.error, 'note');
  const top = formError(decide.error, ['note']);
  function onSubmit(e: FormEvent) {
    e.preventDefault();
    decide.mutate({ decision: 'decline', note: note.trim() || undefined }, { onSuccess: onDone });
  }
  return (
    <form onSubmit={onSubmit} className="space-y-2" noValidate data-testid="offer-decline-form">
      {top ? <Notice tone="error">{top}</Notice> : null}
      <TextAreaField
        label={
          <>
            Why not <span className="font-normal text-ink-400">(optional, the author sees it)</span>
          </>
        }
        error={noteError}
        data-testid="offer-decline-note"
        rows={2}
        maxLength={2000}
        value={note}
        onChange={(e) => setNote(e.target.value)}
        disabled={decide.isPending}
      />
      <div className="flex gap-2">
        <Button type="submit" variant="danger" data-testid="submit-offer-decline" pending={decide.isPending} pendingLabel="Declining…">
          Decline the offer
        </Button>
        <Button variant="ghost" onClick={onDone} disabled={decide.isPending}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

/**
 * Accept or decline one offer back, for the parent's owner (`canDecide`). Accepting sends the
 * parent revision the caller compared against: if the parent moved on meanwhile the server
 * answers 409 and a link to compare again against the newer revision is shown.
 */
export function OfferActions({ offerId, parentDesignId, parentLatestRevision }: { offerId: string; parentDesignId: string; parentLatestRevision: number }) {
  const offers = useOffers(parentDesignId);
  const accept = useDecideOffer(offerId);
  const [declining, setDeclining] = useState(false);

  if (offers.isPending) return <Skeleton lines={1} />;
  if (offers.isError) return <Notice tone="error">{formError(offers.error)}</Notice>;
  const offer = offers.data.incoming.find((o) => o.id === offerId);
  if (!offer) return <Notice tone="error">This offer does not exist, or it was not made to this design.</Notice>;

  const stale = accept.error instanceof ApiError && accept.error.status === 409 ? accept.error.latestRevision : undefined;
  return (
    <div className="space-y-2 text-sm" data-testid="offer-actions">
      <p className="flex flex-wrap items-center gap-2 text-ink-200">
        <Badge tone={offer.state === 'accepted' ? 'result' : offer.state === 'open' ? 'live' : 'neutral'} testId="offer-state">
          {offerStateLabel(offer.state)}
        </Badge>
        <span>
          &ldquo;{offer.fork.title}&rdquo; r{offer.fork.revision}, offered by {personName(offer.offeredBy)} on {formatDateTime(offer.createdAt)}
        </span>
      </p>
      {offer.message ? <p className="whitespace-pre-wrap text-ink-100">&ldquo;{offer.message}&rdquo;</p> : null}
      {offer.state === 'accepted' && offer.resultingRevision !== null ? (
        <p className="text-lagoon-100" data-testid="offer-result">
          It became{' '}
          <Link href={`/designs/${offer.parent.designId}`} className="rounded text-lagoon-400 underline">
            r{offer.resultingRevision} of &ldquo;{offer.parent.title}&rdquo;
          </Link>
          .
        </p>
      ) : null}
      {offer.state === 'declined' && offer.decisionNote ? <p className="text-ink-400">&ldquo;{offer.decisionNote}&rdquo;</p> : null}
      {offer.state === 'open' && offer.canDecide && !declining ? (
        <>
          <p className="text-ink-400">
            Accepting stores the fork&rsquo;s document as a new revision on top of r{parentLatestRevision}, the revision compared here. It is not a
            review or an approval, and it does not certify that the supply is safe.
          </p>
          <div className="flex flex-wrap gap-2">
            <Button
              data-testid="accept-offer"
              pending={accept.isPending}
              pendingLabel="Accepting…"
              onClick={() => accept.mutate({ decision: 'accept', parentBaseRevision: parentLatestRevision })}
            >
              Accept as a new revision
            </Button>
            <Button variant="secondary" data-testid="decline-offer" disabled={accept.isPending} onClick={() => setDeclining(true)}>
              Decline
            </Button>
          </div>
        </>
      ) : null}
      {offer.state === 'open' && offer.canDecide && declining ? <DeclineForm offerId={offerId} onDone={() => setDeclining(false)} /> : null}
      {offer.state === 'open' && !offer.canDecide ? <p className="text-ink-400">The parent&rsquo;s author or a team owner decides on this offer.</p> : null}
      {accept.error ? <Notice tone="error">{formError(accept.error)}</Notice> : null}
      {stale !== undefined ? (
        <Link href={offerCompareHref(offer, stale)} className="rounded text-lagoon-400 hover:underline" data-testid="offer-compare-again">
          Compare against r{stale} and decide again
        </Link>
      ) : null}
    </div>
  );
}
