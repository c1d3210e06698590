import type { ReactNode } from 'react';
import { AppHeader } from '@/components/shell/app-header';
import { getSessionUser } from '@/lib/auth/session';

export default async function AppLayout({ children }: { children: ReactNode }) {
  const user = await getSessionUser();
  const label = user?.name || user?.email || '';
  return (
    <>
      <AppHeader userLabel={label} />
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-6 py-6">
        {children}
      </main>
    </>
  );
}
