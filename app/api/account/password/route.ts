import { passwordChangeSchema } from '@/lib/api/contract';
import { route } from '@/lib/api/handler';
import { changePassword } from '@/lib/data/account';

export const POST = route({ body: passwordChangeSchema }, async ({ user, body }) => {
  await changePassword(user.id, body);
  return { ok: true };
});
