import { getServerSession } from 'next-auth';
import type { ReactNode } from 'react';
import { AppHeader } from '@/components/shell/app-header';
import { authOptions } from '@/lib/auth/options';

export default async function AppLayout({ children }: { children: ReactNode }) {
  const session = await getServerSession(authOptions);
  const label = session?.user?.name || session?.user?.email || '';
  return (
    <>
      <AppHeader userLabel={label} />
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-6 py-6">
        {children}
      </main>
    </>
  );
}
