import type { AuthConfig } from '@auth/core';
import { CredentialsSignin } from '@auth/core/errors';
import Credentials from '@auth/core/providers/credentials';
import Nodemailer from '@auth/core/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { db } from '../../db';
import { accounts, sessions, users, verificationTokens } from '../../db/schema';
import { companyOfUser, findAccountByEmail } from '../../db/queries/accounts';
import { recordAudit } from '../../db/queries/audit';
import { endUserSession } from '../../db/queries/sessions';
import { signInLinkMail } from '../mail/messages';
import { sendMail } from '../mail/send';
import { env } from '../server/env';
import { checkPasswordSignIn } from './password-sign-in';
import { authSecret, SESSION_MAX_AGE_S, startSession } from './session';
import { takeMailAllowance } from './throttle';
import { normaliseEmail } from './tokens';

/** Set by our /api/auth endpoint from the connection (a client cannot supply it). */
export const clientAddressHeader = 'x-heatlayer-client-address';

export const SIGN_IN_LINK_MINUTES = 15;

class ThrottledSignIn extends CredentialsSignin {
  code = 'throttled';
}

/**
 * Where Auth.js sends people after they ask for a link (it forwards to the sign-in page, which
 * then says "check your inbox"); the same address whether or not a message was sent.
 */
const linkSentPage = '/api/auth/verify-request?provider=nodemailer&type=email';

/**
 * The Auth.js configuration, built per request because the cookie flags depend on whether the
 * request came over HTTPS. Two ways in: e-mail + password (Credentials) and e-mail links
 * (Nodemailer). Neither creates accounts: people join by invitation only.
 */
export function authConfig(opts: { secure: boolean }): AuthConfig {
  return {
    basePath: '/api/auth',
    secret: authSecret(),
    trustHost: true,
    useSecureCookies: opts.secure,
    // The credentials provider only works with JWT sessions; the adapter still stores users and link tokens.
    session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_S },
    adapter: DrizzleAdapter(db(), {
      usersTable: users,
      accountsTable: accounts,
      sessionsTable: sessions,
      verificationTokensTable: verificationTokens,
    }),
    pages: { signIn: '/signin', error: '/signin', verifyRequest: '/signin' },
    logger: {
      // Wrong passwords and expired links are expected; they are in the audit log, not the server log.
      error(error) {
        const type = (error as { type?: string }).type;
        if (
          type === 'CredentialsSignin' ||
          type === 'Verification' ||
          type === 'AccessDenied' ||
          type === 'MissingCSRF'
        )
          return;
        console.error('[auth]', error);
      },
      warn() {},
    },
    providers: [
      Credentials({
        credentials: {
          email: { label: 'E-mail address', type: 'email' },
          password: { label: 'Password', type: 'password' },
        },
        async authorize(credentials, request) {
          const address = request.headers.get(clientAddressHeader) ?? 'unknown';
          const result = await checkPasswordSignIn(credentials, address);
          if (result.ok) return result.user;
          if (result.reason === 'throttled') throw new ThrottledSignIn();
          return null;
        },
      }),
      Nodemailer({
        server: env().SMTP_URL,
        from: env().MAIL_FROM,
        maxAge: SIGN_IN_LINK_MINUTES * 60,
        async sendVerificationRequest({ identifier, url }) {
          const account = await findAccountByEmail(identifier);
          // Sent in the background: answering as fast for an unknown address as for a known one.
          void sendMail({
            to: identifier,
            companyId: account?.companyId ?? null,
            ...signInLinkMail(url, SIGN_IN_LINK_MINUTES),
          }).catch((err) => console.error('[auth] could not send a sign-in link:', err));
          await recordAudit({
            companyId: account?.companyId ?? null,
            actorUserId: null,
            action: 'signin.link_sent',
            subject: identifier,
          });
        },
      }),
    ],
    callbacks: {
      async signIn({ user, account, email }) {
        if (account?.provider !== 'nodemailer') return true;
        const known = await findAccountByEmail(normaliseEmail(user.email ?? ''));
        if (email?.verificationRequest) {
          // Unknown address, or too many links asked for: land on the same "check your inbox"
          // page without sending anything, so the answer reveals nothing.
          if (!known?.companyId || !(await takeMailAllowance(normaliseEmail(user.email ?? '')))) return linkSentPage;
          return true;
        }
        return !!known?.companyId;
      },
      async jwt({ token, user }) {
        // `user` is there only at sign-in: that is when the server-side session record starts.
        if (user?.id) {
          token.sub = user.id;
          token.sid = await startSession(user.id);
        }
        return token;
      },
      session({ session, token }) {
        if (token.sub) session.user.id = token.sub;
        return session;
      },
    },
    events: {
      async signIn({ user, account }) {
        if (account?.provider !== 'nodemailer' || !user.id) return;
        const known = await findAccountByEmail(user.email ?? '');
        await recordAudit({
          companyId: known?.companyId ?? null,
          actorUserId: user.id,
          action: 'signin.succeeded',
          subject: `user:${user.id}`,
          detail: { method: 'link' },
        });
      },
      async signOut(message) {
        const token = 'token' in message ? message.token : null;
        if (!token?.sub) return;
        // Ends the session on the server too: a copy of the cookie stops working.
        if (typeof token.sid === 'string') await endUserSession(token.sid);
        await recordAudit({
          companyId: await companyOfUser(token.sub),
          actorUserId: token.sub,
          action: 'signout',
          subject: `user:${token.sub}`,
        });
      },
    },
  };
}
