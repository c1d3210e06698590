/**
 * next-auth (v4) configuration: e-mail + password (Credentials, bcrypt) and e-mail sign-in links
 * (Email provider, mailed through lib/mail to the SMTP catcher locally), the Sequelize adapter
 * on our migrated tables (gotcha G7: never synchronised), JWT sessions that carry only the
 * user id. Roles are never put in the token; lib/data reads them from the database each call.
 *
 * Import `authOptions` from '@/lib/auth/options' for `getServerSession(authOptions)`.
 */
import 'server-only';
import type { Adapter } from 'next-auth/adapters';
import type { NextAuthOptions } from 'next-auth';
import CredentialsImport from 'next-auth/providers/credentials';
import EmailImport from 'next-auth/providers/email';
import SequelizeAdapterImport from '@next-auth/sequelize-adapter';
import { z } from 'zod';
import { db } from '../db';
import { sendMail, signInLinkMessage } from '../mail';
import { verifyPassword } from './password';
import { clearFailedSignIns, isSignInLocked, recordFailedSignIn } from './throttle';

declare module 'next-auth' {
  interface Session {
    user: { id: string; name?: string | null; email?: string | null; image?: string | null };
  }
}

/** Gotcha G5: under plain Node ESM a CJS `exports.default` arrives as the module object. */
function cjsDefault<T>(m: T): T {
  const maybe = m as unknown as { default?: T };
  return typeof m === 'function' ? m : (maybe.default ?? m);
}
const CredentialsProvider = cjsDefault(CredentialsImport);
const EmailProvider = cjsDefault(EmailImport);
const SequelizeAdapter = cjsDefault(SequelizeAdapterImport);

/** The error string `signIn('credentials')` reports while an address is locked. */
export const RATE_LIMITED_ERROR = 'rate_limited';

const credentialsSchema = z.object({ email: z.email().max(254), password: z.string().min(1).max(200) });

/** The signed-in user as the Credentials provider returns it. */
export interface AuthorizedUser {
  id: string;
  name: string | null;
  email: string;
}

/**
 * Check an e-mail + password pair, with the failed sign-in limit. Returns the user, or null for
 * a wrong address or password; throws Error(RATE_LIMITED_ERROR) while the address is locked
 * (next-auth hands a thrown message to the client as `error`).
 */
export async function authorizeCredentials(input: unknown): Promise<AuthorizedUser | null> {
  const parsed = credentialsSchema.safeParse(input);
  if (!parsed.success) return null;
  const email = parsed.data.email.toLowerCase();
  if (await isSignInLocked(email)) throw new Error(RATE_LIMITED_ERROR);
  const user = await db().models.User.scope('withPassword').findOne({ where: { email } });
  const ok = await verifyPassword(parsed.data.password, user?.passwordHash);
  if (!user || !ok) {
    await recordFailedSignIn(email);
    return null;
  }
  await clearFailedSignIns(email);
  return { id: user.id, name: user.name, email: user.email };
}

/** The adapter methods next-auth v4 calls (it copies them with Object.keys, so they must be own properties). */
const ADAPTER_METHODS = [
  'createUser',
  'getUser',
  'getUserByEmail',
  'getUserByAccount',
  'updateUser',
  'deleteUser',
  'linkAccount',
  'unlinkAccount',
  'createSession',
  'getSessionAndUser',
  'updateSession',
  'deleteSession',
  'createVerificationToken',
  'useVerificationToken',
] as const;

/**
 * The Sequelize adapter on our models, created on first use: `next build` imports this module
 * with no database in the environment, and Sequelize must not be constructed then.
 */
function lazyAdapter(): Adapter {
  let inner: Adapter | null = null;
  const get = (): Record<string, (...args: unknown[]) => unknown> => {
    if (!inner) {
      const { sequelize, models } = db();
      inner = SequelizeAdapter(sequelize, {
        synchronize: false,
        models: {
          User: models.User,
          Account: models.Account,
          Session: models.Session,
          VerificationToken: models.VerificationToken,
        } as unknown as NonNullable<Parameters<typeof SequelizeAdapter>[1]>['models'],
      });
    }
    return inner as unknown as Record<string, (...args: unknown[]) => unknown>;
  };
  return Object.fromEntries(ADAPTER_METHODS.map((name) => [name, (...args: unknown[]) => get()[name](...args)])) as Adapter;
}

/** The next-auth options (route handler, getServerSession). */
export const authOptions: NextAuthOptions = {
  adapter: lazyAdapter(),
  session: { strategy: 'jwt', maxAge: 30 * 24 * 60 * 60 },
  pages: { signIn: '/signin', verifyRequest: '/check-email', error: '/signin' },
  providers: [
    CredentialsProvider({
      id: 'credentials',
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
      authorize: (credentials) => authorizeCredentials(credentials),
    }),
    // id 'email' (the provider's default)
    EmailProvider({
      // G6: a URL string, so next-auth's default `auth` object is not merged in
      server: process.env.EMAIL_SERVER ?? 'smtp://127.0.0.1:2525',
      from: process.env.EMAIL_FROM ?? 'Kilorung <no-reply@kilorung.test>',
      maxAge: 24 * 60 * 60,
      async sendVerificationRequest({ identifier, url }) {
        await sendMail(signInLinkMessage(identifier, url));
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) token.sub = user.id;
      return token;
    },
    session({ session, token }) {
      if (token.sub) session.user = { ...session.user, id: token.sub };
      return session;
    },
  },
};
