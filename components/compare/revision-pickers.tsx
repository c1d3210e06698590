'use client';
/**
 * The two revision pickers of the compare page. Choosing a revision navigates to the page's
 * address for the new pair (the server loads and solves it); the form also works without
 * script as a plain GET with its "Compare" button.
 */
import { useRouter } from 'next/navigation';
import { buttonClass } from '@/components/ui/button';
import { compareHref } from '@/lib/compare/href';

export interface PickerSide {
  designId: string;
  title: string;
  revision: number;
  revisions: { number: number; message: string; author: string }[];
}

function optionText(r: PickerSide['revisions'][number]): string {
  const message = r.message.trim();
  return `r${r.number}${message ? ` — ${message.length > 48 ? `${message.slice(0, 47)}…` : message}` : ''} (${r.author})`;
}

export function RevisionPickers({ a, b, offerId }: { a: PickerSide; b: PickerSide; offerId: string | null }) {
  const router = useRouter();
  const bDesign = b.designId !== a.designId ? b.designId : null;
  const go = (next: { a: number; b: number }) => router.push(compareHref(a.designId, { ...next, bDesign, offer: offerId }));
  return (
    <form key={`${a.designId}:${a.revision}:${b.designId}:${b.revision}`} method="get" action={`/designs/${encodeURIComponent(a.designId)}/compare`} className="flex flex-wrap items-end gap-3" data-testid="compare-pickers">
      {bDesign ? <input type="hidden" name="bDesign" value={bDesign} /> : null}
      {offerId ? <input type="hidden" name="offer" value={offerId} /> : null}
      <label className="flex flex-col gap-1 text-xs text-ink-200">
        <span>Before{bDesign ? ` · ${a.title}` : ''}</span>
        <select
          name="a"
          defaultValue={a.revision}
          data-testid="compare-pick-a"
          className="rounded-md border border-ink-600 bg-ink-900 px-2 py-1.5 text-sm text-ink-50"
          onChange={(e) => go({ a: Number(e.target.value), b: b.revision })}
        >
          {a.revisions.map((r) => (
            <option key={r.number} value={r.number}>
              {optionText(r)}
            </option>
          ))}
        </select>
      </label>
      <span aria-hidden="true" className="pb-2 text-ink-400">
        →
      </span>
      <label className="flex flex-col gap-1 text-xs text-ink-200">
        <span>After{bDesign ? ` · ${b.title}` : ''}</span>
        <select
          name="b"
          defaultValue={b.revision}
          data-testid="compare-pick-b"
          className="rounded-md border border-ink-600 bg-ink-900 px-2 py-1.5 text-sm text-ink-50"
          onChange={(e) => go({ a: a.revision, b: Number(e.target.value) })}
        >
          {b.revisions.map((r) => (
            <option key={r.number} value={r.number}>
              {optionText(r)}
            </option>
          ))}
        </select>
      </label>
      <button type="submit" className={buttonClass('secondary')}>
        Compare
      </button>
    </form>
  );
}
