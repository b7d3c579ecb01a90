// What the action forms offer: where the user acts from, the liner lots they
// may fit (first-expiry-first-out), the hire orders a bin may go out on.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import type { SiteKind } from '@/lib/scans/lifecycle';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { openOrdersAt } from '@/lib/loads/hire-orders.server';
import { stockAt } from '@/lib/liners/liner-ledger.server';

export interface SiteOption {
  id: number;
  name: string;
  kind: SiteKind;
}
export interface LotOption {
  id: number;
  lotNumber: string;
  supplier: string;
  expiryDate: string;
  onHand: number;
}
export interface OrderOption {
  id: number;
  reference: string;
  customer: string;
  neededBy: string;
  quantity: number;
  loaded: number;
}

/** Where this user records from by default: the yard's home depot, otherwise where the bin stands. */
export async function actingSite(user: SessionUser, binSite: SiteOption | null): Promise<SiteOption | null> {
  if (user.role === 'yard' && user.homeSiteId) {
    const [s] = await sequelize.query<SiteOption>('SELECT id, name, kind FROM sites WHERE id = $1', { bind: [user.homeSiteId], type: QueryTypes.SELECT });
    return s ?? null;
  }
  return binSite;
}

/** Usable lots with liners on the shelf at a depot (the ledger's sum), the one to use first on top (earliest expiry, then oldest receipt). */
export async function lotsAt(siteId: number, today: string): Promise<LotOption[]> {
  const lots = await stockAt(siteId);
  return lots
    .filter((l) => l.status === 'released' && l.expiryDate >= today && l.receivedOn <= today)
    .slice(0, 20)
    .map((l) => ({ id: l.lotId, lotNumber: l.lotNumber, supplier: l.supplier, expiryDate: l.expiryDate, onHand: l.onHand }));
}

/** Hire orders this depot is loading or will load, for the bin's type, soonest first. */
export async function ordersAt(depotId: number, binTypeId: number): Promise<OrderOption[]> {
  const list = await openOrdersAt(depotId, { binTypeId, limit: 20 });
  return list.map(({ id, reference, customer, neededBy, quantity, loaded }) => ({ id, reference, customer, neededBy, quantity, loaded }));
}
