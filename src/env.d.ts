/// <reference path="../.astro/types.d.ts" />

declare namespace App {
  interface Locals {
    user: import('@/lib/accounts/session-user.server').SessionUser | null;
    clientAddress: string;
    /** Set by the app server (src/cli/serve.mjs) from the socket; absent under `astro dev`. */
    connection?: { remoteAddress: string | null; encrypted: boolean; tls: import('./lib/http/forwarded').TlsSource };
  }
}
