import 'server-only';
import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { admin } from 'better-auth/plugins';
import { nextCookies } from 'better-auth/next-js';
import { APIError, createAuthMiddleware } from 'better-auth/api';
import { accountAttemptBlocked, clearAccountAttempts } from './account-throttle';
import { getDb } from '@/db/client';
import * as schema from '@/db/schema';
import { env } from '@/lib/env';
import { sendPasswordResetMail } from '@/lib/mail/auth-mails';
import { accessControl, roles } from './permissions';

export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 128;

function createAuth() {
  const settings = env();
  const rateLimited = settings.APP_ENV !== 'test' || process.env.COUNTERSAMPLE_RATE_LIMIT === 'on';
  return betterAuth({
    appName: 'Countersample',
    baseURL: settings.BETTER_AUTH_URL,
    secret: settings.BETTER_AUTH_SECRET,
    telemetry: { enabled: false },
    database: drizzleAdapter(getDb(), {
      provider: 'pg',
      schema: {
        user: schema.user,
        session: schema.session,
        account: schema.account,
        verification: schema.verification,
        rateLimit: schema.rateLimit,
        userRelations: schema.userRelations,
        sessionRelations: schema.sessionRelations,
        accountRelations: schema.accountRelations,
      },
    }),
    emailAndPassword: {
      enabled: true,
      // No open sign-up: people join through an administrator's invitation.
      disableSignUp: true,
      minPasswordLength: PASSWORD_MIN_LENGTH,
      maxPasswordLength: PASSWORD_MAX_LENGTH,
      resetPasswordTokenExpiresIn: 60 * 60,
      revokeSessionsOnPasswordReset: true,
      sendResetPassword: async ({ user, url }) => {
        await sendPasswordResetMail({ to: user.email, name: user.name, url });
      },
    },
    user: {
      additionalFields: {
        organisationId: { type: 'string', required: true, input: false },
      },
    },
    session: {
      expiresIn: 60 * 60 * 12,
      updateAge: 60 * 60,
      cookieCache: { enabled: false },
    },
    rateLimit: {
      enabled: rateLimited,
      storage: 'database',
      window: 60,
      max: 120,
      customRules: {
        '/sign-in/email': { window: 60, max: 10 },
        '/request-password-reset': { window: 300, max: 5 },
        '/reset-password': { window: 300, max: 10 },
      },
    },
    advanced: {
      useSecureCookies: settings.BETTER_AUTH_URL.startsWith('https://'),
      ipAddress: { ipAddressHeaders: ['x-forwarded-for', 'x-real-ip'] },
      defaultCookieAttributes: { sameSite: 'lax', httpOnly: true },
      // A session is read with its user in one query, on every request that checks who is asking
      // (the relations in db/schema/auth.ts make it possible).
      database: { joins: true },
    },
    hooks: {
      before: createAuthMiddleware(async (ctx) => {
        if (!rateLimited || ctx.path !== '/sign-in/email') return;
        const email = typeof ctx.body?.email === 'string' ? ctx.body.email : '';
        if (email && (await accountAttemptBlocked(email))) {
          throw new APIError('TOO_MANY_REQUESTS', { message: 'Too many failed sign-ins for this account. Wait 15 minutes, or reset the password.' });
        }
      }),
      after: createAuthMiddleware(async (ctx) => {
        if (!rateLimited || ctx.path !== '/sign-in/email' || !ctx.context.newSession) return;
        await clearAccountAttempts(ctx.context.newSession.user.email);
      }),
    },
    plugins: [
      admin({ ac: accessControl, roles, defaultRole: 'supplier', adminRoles: ['admin'] }),
      // Lets server actions set the session cookie; must stay last.
      nextCookies(),
    ],
  });
}

export type Auth = ReturnType<typeof createAuth>;

const globalForAuth = globalThis as unknown as { __countersampleAuth?: Auth };

/** Created on first use so that importing this module never opens the database. */
export function getAuth(): Auth {
  globalForAuth.__countersampleAuth ??= createAuth();
  return globalForAuth.__countersampleAuth;
}

export function resetAuthForTests(): void {
  globalForAuth.__countersampleAuth = undefined;
}
