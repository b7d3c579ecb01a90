import { endpoint } from '@/lib/endpoint.server';
import { loadDepotSnapshot } from '@/lib/yard/depot-snapshot.server';
import { AppError } from '@/lib/api-errors';

/** The yard user's home depot as a phone keeps it for offline work (see src/lib/yard/yard-offline.ts). */
export const GET = endpoint({ capability: 'home.yard' }, async ({ user }) => {
  if (!user.homeSiteId) throw new AppError('unprocessable', 'You have no home depot yet; ask an administrator to set it.');
  const snapshot = await loadDepotSnapshot(user.homeSiteId);
  if (!snapshot) throw new AppError('not_found', 'Your home depot no longer exists; ask an administrator.');
  return snapshot;
});
