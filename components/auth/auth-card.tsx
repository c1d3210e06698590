import type { ReactNode } from 'react';
import { Wordmark } from '@/components/wordmark';

/** Centered card used by the sign-in, sign-up and check-your-mail screens. */
export function AuthCard({ title, children, footer }: { title: string; children: ReactNode; footer?: ReactNode }) {
  return (
    <main id="main" className="flex flex-1 items-start justify-center px-6 py-12">
      <div className="w-full max-w-md">
        <div className="mb-6 flex justify-center">
          <Wordmark size="lg" />
        </div>
        <div className="rounded-lg border border-ink-800 bg-ink-800/60 p-6">
          <h1 className="mb-4 text-xl font-semibold text-ink-50">{title}</h1>
          {children}
        </div>
        {footer ? <div className="mt-4 text-center text-sm text-ink-400">{footer}</div> : null}
      </div>
    </main>
  );
}
