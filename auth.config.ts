import Credentials from '@auth/core/providers/credentials';
import { defineConfig } from 'auth-astro';
import { SESSION_MAX_AGE_S } from './src/lib/session/session-cookie';

// Sessions are encrypted JWT cookies (stateless app servers). Auth.js issues
// them at sign-in and clears them at sign-out; on every other request the
// middleware decodes the cookie itself and re-reads the user row
// (src/lib/session/), so a deactivation, a role change, a sign-out elsewhere
// or "end all sessions" takes effect at once even though the token lives on.
export default defineConfig({
  secret: process.env.AUTH_SECRET,
  trustHost: true,
  session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: '/login', error: '/login' },
  // A failed sign-in is an expected outcome (shown on the page, rate-limited),
  // not a server fault: keep it out of the error log.
  logger: {
    error(error) {
      const type = (error as { type?: string }).type ?? error.name;
      if (type === 'CredentialsSignin') return;
      console.error('[auth]', error);
    },
  },
  providers: [
    Credentials({
      credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
      // Loaded lazily so the config (evaluated at build time) never opens a database connection.
      async authorize(credentials, request) {
        const { authorizeSignIn } = await import('@/lib/accounts/sign-in.server');
        return authorizeSignIn(credentials, request);
      },
    }),
  ],
  events: {
    // Signing out ends this session on the server too: a saved copy of the
    // cookie stops working, the person's other devices keep theirs.
    async signOut(message) {
      if (!('token' in message) || !message.token) return;
      const { endSession } = await import('./src/lib/session/session-ends.server');
      await endSession(message.token as Record<string, unknown>);
    },
  },
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.uid = (user as { id: string }).id;
        token.role = (user as { role?: string }).role;
        // This session's own id (sign-out ends it alone) and the person's
        // session epoch now (ending all their sessions counts it up).
        token.sid = crypto.randomUUID();
        token.epoch = (user as { sessionEpoch?: number }).sessionEpoch ?? 0;
      }
      return token;
    },
    session({ session, token }) {
      (session as unknown as { uid?: unknown }).uid = token.uid;
      (session as unknown as { role?: unknown }).role = token.role;
      return session;
    },
  },
});
