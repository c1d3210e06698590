import Link from 'next/link';
import { Wordmark } from '@/components/wordmark';
import { SignOutButton } from './sign-out-button';

/** Top bar of the signed-in screens: wordmark, main links, who is signed in. */
export function AppHeader({ userLabel }: { userLabel: string }) {
  return (
    <header className="border-b border-ink-800 bg-ink-900/95">
      <div className="mx-auto flex max-w-6xl items-center gap-6 px-6 py-3">
        <Wordmark href="/teams" />
        <nav aria-label="Main" className="flex items-center gap-1 text-sm">
          <Link href="/teams" className="rounded px-2 py-1 text-ink-200 hover:bg-ink-800 hover:text-ink-50">
            Teams
          </Link>
          <Link href="/activity" className="rounded px-2 py-1 text-ink-200 hover:bg-ink-800 hover:text-ink-50" data-testid="nav-activity">
            Activity
          </Link>
          <Link href="/account" className="rounded px-2 py-1 text-ink-200 hover:bg-ink-800 hover:text-ink-50">
            Account
          </Link>
        </nav>
        <div className="ml-auto flex items-center gap-3 text-sm text-ink-400">
          <span data-testid="signed-in-as" className="hidden sm:inline">
            {userLabel}
          </span>
          <SignOutButton />
        </div>
      </div>
    </header>
  );
}
