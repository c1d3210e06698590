import { route } from '@/lib/api/handler';
import { getMe } from '@/lib/data/account';

export const GET = route({}, async ({ user }) => getMe(user.id));
