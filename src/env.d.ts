/// <reference path="../.astro/types.d.ts" />

declare namespace App {
  interface Locals {
    user: import('./lib/server/session-user').SessionUser | null;
    clientAddress: string;
  }
}
