import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { admin } from 'better-auth/plugins';
import { createAccessControl } from 'better-auth/plugins/access';
import { adminAc, defaultStatements } from 'better-auth/plugins/admin/access';
import { and, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { DEFAULT_ROLE, ROLES, rolesWith } from '../access';
import { serverEnv } from './env';
import { sendMail } from './mail';

/** Header the HTTP layer sets from the socket's address; any client-sent copy is dropped. */
export const CLIENT_IP_HEADER = 'x-sluice-client-ip';

const ac = createAccessControl(defaultStatements);
/**
 * The admin plugin's roles, made from access.ts: it only needs to know who administers users
 * (the roles granted users:manage); Sluice's own grants stay in access.ts.
 */
const userAdminRoles = rolesWith('users:manage');
const pluginRoles = Object.fromEntries(
  ROLES.map((role) => [role, ac.newRole(userAdminRoles.includes(role) ? { ...adminAc.statements } : {})]),
) as Record<(typeof ROLES)[number], ReturnType<typeof ac.newRole>>;

function createAuth() {
  const env = serverEnv();
  return betterAuth({
    appName: 'Sluice',
    baseURL: env.publicUrl,
    basePath: '/api/auth',
    secret: env.authSecret,
    trustedOrigins: env.trustedOrigins,
    telemetry: { enabled: false },
    logger: { level: 'error' },
    database: drizzleAdapter(getDb(), { provider: 'pg', schema }),
    emailAndPassword: {
      enabled: true,
      disableSignUp: true,
      minPasswordLength: 10,
      resetPasswordTokenExpiresIn: 60 * 60 * 48,
      sendResetPassword: async ({ user, token }) => {
        const link = `${env.publicUrl}/set-password?token=${encodeURIComponent(token)}`;
        const pending = await getDb()
          .select({ id: schema.invitation.id })
          .from(schema.invitation)
          .where(and(eq(schema.invitation.userId, user.id), isNull(schema.invitation.acceptedAt)))
          .limit(1);
        if (pending.length > 0) {
          await sendMail({
            to: user.email,
            subject: 'You are invited to Sluice',
            text:
              `Hello ${user.name},\n\nYou have been given an account on Sluice, the lab's system for ` +
              `measuring, binning and matching JFETs.\n\nChoose your password here (the link works for 48 hours):\n${link}\n\n` +
              `If you did not expect this, ignore this message.`,
          });
        } else {
          await sendMail({
            to: user.email,
            subject: 'Reset your Sluice password',
            text: `Hello ${user.name},\n\nSomeone asked to reset your Sluice password. Choose a new one here:\n${link}\n\nIf it was not you, ignore this message.`,
          });
        }
      },
      onPasswordReset: async ({ user }) => {
        await getDb()
          .update(schema.invitation)
          .set({ acceptedAt: new Date() })
          .where(and(eq(schema.invitation.userId, user.id), isNull(schema.invitation.acceptedAt)));
      },
    },
    session: { expiresIn: 60 * 60 * 24 * 7, updateAge: 60 * 60 * 24 },
    rateLimit: {
      enabled: true,
      storage: 'database',
      modelName: 'rateLimit',
      window: 60,
      max: 300,
      customRules: {
        '/sign-in/email': { window: 60, max: env.signInLimitPerMinute },
        '/request-password-reset': { window: 60, max: 5 },
      },
    },
    advanced: {
      // Set by the auth route from Astro's clientAddress, which the server entry takes from the
      // socket (or a trusted proxy): see src/http-front/front.mjs.
      ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
      defaultCookieAttributes: { httpOnly: true, sameSite: 'lax' },
      useSecureCookies: env.publicUrl.startsWith('https://'),
    },
    plugins: [admin({ ac, roles: pluginRoles, defaultRole: DEFAULT_ROLE, adminRoles: [...userAdminRoles] })],
  });
}

export type Auth = ReturnType<typeof createAuth>;
let instance: Auth | undefined;

export function getAuth(): Auth {
  instance ??= createAuth();
  return instance;
}
