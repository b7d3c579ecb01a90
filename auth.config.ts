import Credentials from '@auth/core/providers/credentials';
import { defineConfig } from 'auth-astro';

// Sessions are signed JWT cookies (stateless app servers). The middleware
// re-reads the user row on every request, so a deactivation or role change
// takes effect at once even though the token lives on.
export default defineConfig({
  secret: process.env.AUTH_SECRET,
  trustHost: true,
  session: { strategy: 'jwt', maxAge: 12 * 60 * 60 },
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
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.uid = (user as { id: string }).id;
        token.role = (user as { role?: string }).role;
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
