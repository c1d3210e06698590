'use client';

import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';

/**
 * A modal dialog on the native `<dialog>` (focus kept inside, Escape closes, the page behind is
 * inert). Open while mounted with `open`; `onClose` runs on Escape, the close button or a
 * programmatic close.
 */
export function Modal({ open, onClose, title, children, testId, wide = false }: { open: boolean; onClose: () => void; title: ReactNode; children: ReactNode; testId?: string; wide?: boolean }) {
  const ref = useRef<HTMLDialogElement>(null);
  const headingId = useId();
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      aria-labelledby={headingId}
      onClose={onClose}
      className={`m-auto w-full ${wide ? 'max-w-4xl' : 'max-w-2xl'} rounded-lg border border-ink-600 bg-ink-800 p-0 text-ink-100 shadow-2xl backdrop:bg-black/60`}
      data-testid={testId}
    >
      {open ? (
        <div className="space-y-4 p-6">
          <div className="flex items-start justify-between gap-4">
            <h2 id={headingId} className="text-lg font-semibold text-ink-50">
              {title}
            </h2>
            <Button variant="ghost" onClick={onClose} aria-label="Close">
              ✕
            </Button>
          </div>
          {children}
        </div>
      ) : null}
    </dialog>
  );
}
