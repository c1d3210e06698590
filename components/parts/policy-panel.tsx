'use client';

import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { Notice, Panel, Skeleton } from '@/components/ui/notice';
import { fieldError, formError } from '@/lib/client/api';
import { formatPercent } from '@/lib/editor/format';
import { usePartsPolicy, useSetPartsPolicy } from '@/lib/client/parts';
import { readField } from '@/lib/editor/fields';
import { DEFAULT_DERATING_FRACTION } from '@/lib/parts/derating';

/**
 * The team's derating policy: every design of the team is judged at this share of each part's
 * rating, or at its own setting when that is stricter. The owner sets it; everyone else reads it.
 */
export function PolicyPanel({ teamId, canEdit }: { teamId: string; canEdit: boolean }) {
  const policy = usePartsPolicy(teamId);
  const save = useSetPartsPolicy(teamId);
  const [text, setText] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const fraction = policy.data?.policy.deratingFraction;

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const r = readField(text ?? '', { unit: '%', rule: 'fraction', scale: 100 });
    if (!r.ok || r.value === undefined) return setError(r.ok ? 'required' : r.reason);
    setError(null);
    save.mutate({ deratingFraction: r.value }, { onSuccess: () => setText(null) });
  }

  return (
    <Panel title="Derating policy" testId="parts-policy">
      {policy.isPending ? (
        <Skeleton lines={1} />
      ) : policy.isError ? (
        <Notice tone="error">{formError(policy.error)}</Notice>
      ) : (
        <div className="space-y-2 text-sm">
          <p className="text-ink-100">
            Parts are judged at <strong data-testid="policy-fraction" data-fraction={fraction}>{formatPercent(fraction ?? DEFAULT_DERATING_FRACTION)}</strong> of their ratings in this team&apos;s designs (a design&apos;s own setting applies when it is stricter). Common practice is 80 %; a
            lower figure leaves more in hand for high-voltage parts that age, heat or see transients.
          </p>
          {canEdit ? (
            <form onSubmit={onSubmit} className="flex flex-wrap items-end gap-2" noValidate>
              <div>
                <label htmlFor="policy-input" className="mb-1 block text-xs font-medium text-ink-200">
                  New share of rating allowed
                </label>
                <div className="flex items-stretch overflow-hidden rounded-md border border-ink-600 bg-ink-900">
                  <input
                    id="policy-input"
                    value={text ?? (fraction !== undefined ? String(Number((fraction * 100).toPrecision(6))) : '')}
                    onChange={(e) => setText(e.target.value)}
                    className="w-24 bg-transparent px-2 py-1 font-mono text-sm text-ink-50 outline-none"
                    data-testid="policy-input"
                    aria-invalid={error ? true : undefined}
                  />
                  <span className="flex items-center border-l border-ink-600 bg-ink-800 px-2 font-mono text-xs text-ink-200">%</span>
                </div>
              </div>
              <Button type="submit" variant="secondary" pending={save.isPending} pendingLabel="Saving…" disabled={text === null} data-testid="policy-save">
                Set policy
              </Button>
              {error || save.error ? (
                <p role="alert" className="w-full text-xs text-hazard-100">
                  {error ?? fieldError(save.error, 'deratingFraction') ?? formError(save.error)}
                </p>
              ) : null}
            </form>
          ) : (
            <p className="text-xs text-ink-400" data-testid="policy-read-only">
              Only the team&apos;s owner changes the policy.
            </p>
          )}
        </div>
      )}
    </Panel>
  );
}
