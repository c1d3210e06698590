'use client';

import { signOut } from 'next-auth/react';
import { useState } from 'react';
import { Button } from '@/components/ui/button';

/** Ends the session and returns to the landing page. */
export function SignOutButton() {
  const [pending, setPending] = useState(false);
  return (
    <Button
      variant="ghost"
      pending={pending}
      pendingLabel="Signing out…"
      data-testid="sign-out"
      onClick={() => {
        setPending(true);
        void signOut({ callbackUrl: '/' });
      }}
    >
      Sign out
    </Button>
  );
}
