// Receiving liners at a depot (yard staff on the phone): the options the form offers, and the receipt itself —
// the certificate stored like other attachments (type sniffed, size capped), the lot and its receipt move
// written together, against a purchase order or not (liner-ledger.server.ts receiveLot).
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { storeAttachment } from '@/lib/attachments.server';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate } from '@/lib/calendar';
import { receiveLot } from './liner-ledger.server';
import { listPurchaseOrders } from './purchase-orders.server';
import { poReference } from './purchase-orders';

const rows = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });

export interface ReceivingOptions {
  depot: { id: number; name: string } | null;
  suppliers: Array<{ id: number; name: string }>;
  specs: Array<{ id: number; code: string; name: string; supplierId: number | null; foodContact: boolean }>;
  orders: Array<{ id: number; reference: string; supplierId: number; specId: number; remaining: number }>;
}

export async function receivingOptions(siteId: number | null): Promise<ReceivingOptions> {
  const [depot] = siteId ? await rows<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE id = $1 AND kind = 'depot' AND active`, [siteId]) : [];
  const [suppliers, specs] = await Promise.all([
    rows<{ id: number; name: string }>('SELECT id, name FROM liner_suppliers WHERE active ORDER BY name'),
    rows<ReceivingOptions['specs'][number]>('SELECT id, code, name, supplier_id AS "supplierId", food_contact AS "foodContact" FROM liner_specs WHERE active ORDER BY code'),
  ]);
  const orders = depot
    ? (await listPurchaseOrders({ depotSiteId: depot.id, openOnly: true })).map((o) => ({
        id: o.id,
        reference: o.reference,
        supplierId: o.supplierId,
        specId: o.specId,
        remaining: o.remaining,
      }))
    : [];
  return { depot: depot ?? null, suppliers, specs, orders };
}

export interface ReceiptForm {
  supplierId: number;
  linerSpecId: number;
  lotNumber: string;
  quantity: number;
  manufacturedOn?: string;
  expiryDate: string;
  purchaseOrderId?: number;
}

/** A lot received at the user's home depot, with its certificate (required for food-contact liners). */
export async function receiveAtDepot(
  user: { id: number; organisationId: number; homeSiteId: number | null },
  input: ReceiptForm,
  certificate: { bytes: Uint8Array; filename: string | null } | null,
  opts: { now?: Date } = {},
): Promise<{ lotId: number; lotNumber: string; purchaseOrder: string | null; purchaseOrderClosed: boolean }> {
  const now = opts.now ?? new Date();
  if (!user.homeSiteId) throw new AppError('unprocessable', 'You have no home depot, so Loopfold does not know where the liners arrive. Ask an administrator to set it.');
  const { timeZone } = await getSettings();
  const receivedOn = localDate(now, timeZone);
  const [spec] = await rows<{ code: string; name: string; supplier_id: number | null; food_contact: boolean }>(
    'SELECT code, name, supplier_id, food_contact FROM liner_specs WHERE id = $1 AND active',
    [input.linerSpecId],
  );
  if (!spec) throw new AppError('validation_failed', 'Choose the liner spec on the carton.', [{ path: 'linerSpecId', message: 'Choose the liner spec.' }]);
  const [supplier] = await rows<{ name: string }>('SELECT name FROM liner_suppliers WHERE id = $1 AND active', [input.supplierId]);
  if (!supplier) throw new AppError('validation_failed', 'Choose the supplier.', [{ path: 'supplierId', message: 'Choose the supplier.' }]);
  if (spec.supplier_id !== null && spec.supplier_id !== input.supplierId) {
    throw new AppError('validation_failed', `${spec.code} comes from another supplier.`, [{ path: 'linerSpecId', message: 'Not a spec of this supplier.' }]);
  }
  const problems: Array<{ path: string; message: string }> = [];
  if (input.expiryDate <= receivedOn) problems.push({ path: 'expiryDate', message: 'The lot has expired already: do not receive it; tell a planner.' });
  if (input.manufacturedOn && input.manufacturedOn > receivedOn) problems.push({ path: 'manufacturedOn', message: 'The manufacture date is after today.' });
  if (input.manufacturedOn && input.manufacturedOn >= input.expiryDate) problems.push({ path: 'manufacturedOn', message: 'The manufacture date must be before the expiry date.' });
  if (spec.food_contact && !certificate)
    problems.push({ path: 'certificate', message: 'Food-contact liners need their declaration of compliance: photograph it or upload the PDF.' });
  if (problems.length) throw new AppError('validation_failed', problems.map((p) => p.message).join(' '), problems);

  return sequelize.transaction(async (t) => {
    const cert = certificate ? await storeAttachment({ ...certificate, purpose: 'certificate', organisationId: user.organisationId, uploadedBy: user.id }, t) : null;
    const out = await receiveLot(
      { id: user.id },
      {
        supplier: supplier.name,
        lotNumber: input.lotNumber,
        spec: `${spec.code} ${spec.name}`.slice(0, 160),
        quantity: input.quantity,
        receivedOn,
        expiryDate: input.expiryDate,
        siteId: user.homeSiteId!,
        certificateId: cert?.id ?? null,
        linerSpecId: input.linerSpecId,
        supplierId: input.supplierId,
        purchaseOrderId: input.purchaseOrderId ?? null,
        manufacturedOn: input.manufacturedOn ?? null,
      },
      { transaction: t, now },
    );
    return {
      lotId: out.lotId,
      lotNumber: input.lotNumber,
      purchaseOrder: input.purchaseOrderId ? poReference(input.purchaseOrderId) : null,
      purchaseOrderClosed: out.purchaseOrderClosed,
    };
  });
}
