import type { Metadata } from 'next';
import { AccountRoot } from '@/components/account/account-root';
import { requireUser } from '../require-user';

export const metadata: Metadata = { title: 'Account' };

export default async function AccountPage() {
  const user = await requireUser('/account');
  return <AccountRoot name={user.name} email={user.email} />;
}
