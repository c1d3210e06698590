import { ButtonLink } from '@/components/ui/button';
import { Wordmark } from '@/components/wordmark';

export default function NotFound() {
  return (
    <main id="main" className="mx-auto flex w-full max-w-xl flex-1 flex-col items-start justify-center gap-4 px-6 py-16">
      <Wordmark />
      <h1 className="text-2xl font-semibold text-ink-50" data-testid="not-found">
        Nothing here
      </h1>
      <p className="text-ink-200">This page does not exist, or you do not have access to it.</p>
      <ButtonLink href="/teams" variant="secondary">
        Go to your teams
      </ButtonLink>
    </main>
  );
}
