'use client';

import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { Badge, Notice, Panel, Skeleton } from '@/components/ui/notice';
import type { DesignDetailDto, OfferDto } from '@/lib/api/contract';
import { fieldError, formError } from '@/lib/client/api';
import { formatDateTime, offerStateLabel, personName } from '@/lib/client/format';
import { offerCompareHref } from '@/lib/client/review-view';
import { useOfferBack, useOffers, useWithdrawOffer } from './offer-actions';

function stateTone(state: OfferDto['state']) {
  return state === 'accepted' ? 'result' : state === 'open' ? 'live' : 'neutral';
}

function OfferBackForm({ design, onDone }: { design: DesignDetailDto; onDone: () => void }) {
  const offer = useOfferBack(design.id);
  const [message, setMessage] = useState('');
  const messageError = fieldError(offer.error, 'message');
  const top = formError(offer.error, ['message']);
  function onSubmit(e: FormEvent) {
    e.preventDefault();
    offer.mutate({ revision: design.latestRevision, message: message.trim() || undefined }, { onSuccess: onDone });
  }
  return (
    <form onSubmit={onSubmit} className="space-y-2 rounded-md border border-ink-600 p-3" noValidate data-testid="offer-back-form">
      <p className="text-sm text-ink-200">
        Offer r{design.latestRevision} of this fork to &ldquo;{design.forkedFrom?.title}&rdquo;. Its owner compares it with their latest revision and
        decides; nothing changes there until they accept.
      </p>
      {top ? <Notice tone="error">{top}</Notice> : null}
      <TextAreaField
        label={
          <>
            Message <span className="font-normal text-ink-400">(optional)</span>
          </>
        }
        error={messageError}
        data-testid="offer-message"
        rows={2}
        maxLength={500}
        value={message}
        onChange={(e) => setMessage(e.target.value)}
        disabled={offer.isPending}
        placeholder="What did you change, and why?"
      />
      <div className="flex gap-2">
        <Button type="submit" data-testid="send-offer" pending={offer.isPending} pendingLabel="Offering…">
          Offer r{design.latestRevision}
        </Button>
        <Button variant="ghost" onClick={onDone} disabled={offer.isPending}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function Incoming({ offers, parentLatest }: { offers: OfferDto[]; parentLatest: number }) {
  if (offers.length === 0) return null;
  return (
    <div>
      <h3 className="mb-1 text-sm font-semibold text-ink-100">Offered back to this design</h3>
      <ul className="space-y-2" data-testid="incoming-offers">
        {offers.map((o) => (
          <li key={o.id} className="rounded-md border border-ink-800 px-3 py-2 text-sm" data-testid="incoming-offer" data-state={o.state}>
            <p className="flex flex-wrap items-center gap-2">
              <Badge tone={stateTone(o.state)}>{offerStateLabel(o.state)}</Badge>
              <Link href={`/designs/${o.fork.designId}`} className="rounded text-lagoon-400 hover:underline">
                {o.fork.title}
              </Link>
              <span className="text-ink-400">r{o.fork.revision}</span>
            </p>
            <p className="text-xs text-ink-400">
              by {personName(o.offeredBy)}, {formatDateTime(o.createdAt)}
            </p>
            {o.message ? <p className="mt-1 whitespace-pre-wrap text-ink-100">&ldquo;{o.message}&rdquo;</p> : null}
            {o.state === 'open' ? (
              <Link href={offerCompareHref(o, parentLatest)} className="mt-1 inline-block rounded text-lagoon-400 hover:underline" data-testid="offer-compare-link">
                {o.canDecide ? 'Compare and decide' : 'Compare with the latest revision'}
              </Link>
            ) : null}
            {o.state === 'accepted' && o.resultingRevision !== null ? <p className="mt-1 text-lagoon-100">Became r{o.resultingRevision}.</p> : null}
            {o.state === 'declined' && o.decisionNote ? <p className="mt-1 text-ink-400">&ldquo;{o.decisionNote}&rdquo;</p> : null}
          </li>
        ))}
      </ul>
    </div>
  );
}

function Outgoing({ offers, userId }: { offers: OfferDto[]; userId: string }) {
  const withdraw = useWithdrawOffer();
  if (offers.length === 0) return null;
  return (
    <div>
      <h3 className="mb-1 text-sm font-semibold text-ink-100">Offered from this fork</h3>
      {withdraw.error ? <Notice tone="error">{formError(withdraw.error)}</Notice> : null}
      <ul className="space-y-2" data-testid="outgoing-offers">
        {offers.map((o) => (
          <li key={o.id} className="rounded-md border border-ink-800 px-3 py-2 text-sm" data-testid="outgoing-offer" data-state={o.state}>
            <p className="flex flex-wrap items-center gap-2">
              <Badge tone={stateTone(o.state)}>{offerStateLabel(o.state)}</Badge>
              <span className="text-ink-200">r{o.fork.revision}</span>
              <span className="text-xs text-ink-400">{formatDateTime(o.createdAt)}</span>
            </p>
            {o.decidedBy && o.decidedAt ? (
              <p className="text-xs text-ink-400">
                {o.state === 'accepted' ? 'Accepted' : 'Declined'} by {personName(o.decidedBy)}, {formatDateTime(o.decidedAt)}
                {o.state === 'accepted' && o.resultingRevision !== null ? ` as r${o.resultingRevision} of the parent` : ''}
              </p>
            ) : null}
            {o.decisionNote ? <p className="mt-1 whitespace-pre-wrap text-ink-100">&ldquo;{o.decisionNote}&rdquo;</p> : null}
            {o.state === 'open' && o.offeredBy.id === userId ? (
              <Button variant="ghost" className="mt-1" data-testid="withdraw-offer" disabled={withdraw.isPending} onClick={() => withdraw.mutate(o.id)}>
                Take the offer back
              </Button>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}

function Offers({ design, userId }: { design: DesignDetailDto; userId: string }) {
  const offers = useOffers(design.id);
  if (offers.isPending) return <Skeleton lines={2} />;
  if (offers.isError) return <Notice tone="error">{formError(offers.error)}</Notice>;
  return (
    <>
      <Incoming offers={offers.data.incoming} parentLatest={design.latestRevision} />
      <Outgoing offers={offers.data.outgoing} userId={userId} />
    </>
  );
}

/**
 * Where a design comes from and where it went: its parent, its forks, offers back in both
 * directions, and (for the fork's author) offering this fork back to its parent.
 */
export function LineagePanel({ design, userId }: { design: DesignDetailDto; userId: string }) {
  const [offering, setOffering] = useState(false);
  const parent = design.forkedFrom;
  if (!parent && design.forks.length === 0) return null;
  return (
    <Panel title="Lineage" testId="lineage-panel">
      <div className="space-y-4">
        {parent ? (
          <p className="text-sm text-ink-200" data-testid="lineage-parent">
            Parent:{' '}
            <Link href={`/designs/${parent.designId}`} className="rounded text-lagoon-400 hover:underline">
              {parent.title}
            </Link>{' '}
            <span className="text-ink-400">(forked at r{parent.revision})</span>
          </p>
        ) : null}
        {parent && design.permissions.offerBack && !offering ? (
          <Button variant="secondary" data-testid="offer-back" onClick={() => setOffering(true)}>
            Offer back to parent
          </Button>
        ) : null}
        {parent && design.permissions.offerBack && offering ? <OfferBackForm design={design} onDone={() => setOffering(false)} /> : null}
        <Offers design={design} userId={userId} />
        {design.forks.length > 0 ? (
          <div data-testid="forks-panel">
            <h3 className="mb-1 text-sm font-semibold text-ink-100">Forks</h3>
            <ul className="space-y-1 text-sm">
              {design.forks.map((f) => (
                <li key={f.designId}>
                  <Link href={`/designs/${f.designId}`} className="rounded text-lagoon-400 hover:underline">
                    {f.title}
                  </Link>{' '}
                  <span className="text-ink-400">
                    by {personName(f.author)}, from r{f.revision}
                  </span>
                </li>
              ))}
            </ul>
          </div>
        ) : null}
      </div>
    </Panel>
  );
}
