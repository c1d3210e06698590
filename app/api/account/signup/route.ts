import { signUpSchema } from '@/lib/api/contract';
import { publicRoute } from '@/lib/api/handler';
import { signUp } from '@/lib/data/account';

export const POST = publicRoute({ body: signUpSchema, status: 201 }, async ({ body }) => ({ user: await signUp(body) }));
