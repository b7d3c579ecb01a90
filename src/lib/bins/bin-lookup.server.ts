import { Op } from 'sequelize';
import { reachableBins, siteLimited } from '@/lib/customer-scope.server';
import { Asset } from '@/models';
import { parseGrai } from '@/lib/gs1';
import { getSettings } from '@/lib/settings/settings.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';

export type FindResult = { kind: 'found'; grai: string; assetId: number } | { kind: 'many'; matches: Array<{ grai: string; serial: string }> } | { kind: 'none'; message: string };

/**
 * What a typed, pasted or scanned text identifies: a GRAI in any form (element
 * string, Digital Link, EPC URI) or a bin serial. Customers find only bins on
 * hire to them.
 */
export async function findBin(text: string, user: Pick<SessionUser, 'role' | 'organisationId' | 'siteIds'>): Promise<FindResult> {
  const q = text.trim().slice(0, 300);
  if (!q) return { kind: 'none', message: 'Type a GRAI, a label link or a serial.' };
  const scope = user.role === 'customer' ? { customerId: user.organisationId } : {};
  const settings = await getSettings();
  const parsed = parseGrai(q, { companyPrefixLength: settings.gs1PrefixLength });
  if (parsed.ok) {
    const found = await Asset.findOne({ where: { grai: parsed.grai.value, ...scope }, attributes: ['id', 'grai'] });
    // A customer user limited to some sites finds only the bins at (or for) those sites.
    const asset = found && siteLimited(user) && !(await reachableBins(user, [found.id])).has(found.id) ? null : found;
    return asset
      ? { kind: 'found', grai: asset.grai, assetId: asset.id }
      : { kind: 'none', message: `No bin with GRAI ${parsed.grai.value} is registered${user.role === 'customer' ? ' to your organisation' : ''}.` };
  }
  // Not a GRAI: perhaps a serial (labels print it under the code).
  if (/^[!-~]{1,16}$/.test(q)) {
    const matched = await Asset.findAll({ where: { serial: { [Op.in]: [q, q.toUpperCase()] }, ...scope }, attributes: ['id', 'grai', 'serial'], limit: 10 });
    const reach = siteLimited(user)
      ? await reachableBins(
          user,
          matched.map((r) => r.id),
        )
      : null;
    const rows = reach ? matched.filter((r) => reach.has(r.id)) : matched;
    if (rows.length === 1) return { kind: 'found', grai: rows[0]!.grai, assetId: rows[0]!.id };
    if (rows.length > 1) return { kind: 'many', matches: rows.map((r) => ({ grai: r.grai, serial: r.serial })) };
  }
  // Looks like a GRAI attempt: say what is wrong with it (check digit, length, characters).
  if (/\d{8,}/.test(q) || q.includes('8003') || q.startsWith('urn:epc')) return { kind: 'none', message: parsed.error.message };
  return { kind: 'none', message: `Nothing matches “${q}”: not a GRAI and no bin has that serial.` };
}
