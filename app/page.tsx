import { redirect } from 'next/navigation';
import { ButtonLink } from '@/components/ui/button';
import { Wordmark } from '@/components/wordmark';
import { getSessionUser } from '@/lib/auth/session';

export default async function LandingPage() {
  const user = await getSessionUser();
  if (user) redirect('/teams');
  return (
    <main id="main" className="mx-auto flex w-full max-w-4xl flex-1 flex-col justify-center gap-10 px-6 py-16">
      <Wordmark size="lg" />
      <div className="space-y-5">
        <h1 className="max-w-2xl text-4xl font-semibold leading-tight tracking-tight text-ink-50">
          Ladder multipliers, worked out with your team.
        </h1>
        <p className="max-w-2xl text-lg text-ink-200">
          Kilorung is for engineers who build high-voltage DC supplies from diode–capacitor ladders. Lay out a half-wave,
          full-wave or symmetric cascade, keep every revision, and let colleagues fork a design to try their own stage
          count, capacitors or drive, without losing the original.
        </p>
        <ul className="grid max-w-2xl gap-3 text-sm text-ink-200 sm:grid-cols-3">
          <li className="rounded-md border border-ink-800 bg-ink-800/60 p-3">
            <span className="block font-medium text-copper-400">Start from a ladder</span>
            Pick a topology, stage count, drive and capacitance.
          </li>
          <li className="rounded-md border border-ink-800 bg-ink-800/60 p-3">
            <span className="block font-medium text-lagoon-400">Every save kept</span>
            Revisions are never overwritten; conflicts are caught.
          </li>
          <li className="rounded-md border border-ink-800 bg-ink-800/60 p-3">
            <span className="block font-medium text-ink-50">Teams and roles</span>
            Owners, designers, reviewers and viewers.
          </li>
        </ul>
      </div>
      <div className="flex gap-3">
        <ButtonLink href="/signin" data-testid="landing-signin">
          Sign in
        </ButtonLink>
        <ButtonLink href="/signup" variant="secondary" data-testid="landing-signup">
          Create an account
        </ButtonLink>
      </div>
      <p className="max-w-2xl rounded-md border border-copper-600 bg-copper-800/30 px-4 py-3 text-sm text-copper-100">
        A multiplier that reaches kilovolts holds lethal charge even after the drive is switched off. Estimates and
        simulations in Kilorung are engineering aids; discharge, insulate and test under your local codes, with licensed
        people signing off.
      </p>
    </main>
  );
}
