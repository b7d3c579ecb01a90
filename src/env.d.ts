/// <reference path="../.astro/types.d.ts" />

declare namespace App {
  interface Locals {
    user: import('@/lib/accounts/session-user.server').SessionUser | null;
    clientAddress: string;
  }
}
