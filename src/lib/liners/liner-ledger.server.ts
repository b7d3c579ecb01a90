// The liner stock ledger (liner_moves): writing moves, reading on hand.
//
// On hand per lot and depot is the sum of the lot's moves there. Every path that takes liners off
// a shelf first locks the lot's row (SELECT … FOR UPDATE) in its own transaction, then reads the sum
// and refuses what the depot does not hold; concurrent takers of the same lot queue on that lock, so
// none reads a stock another is about to spend. The table's statement trigger refuses a negative
// balance as a last guard. Rules (kinds, signs, reasons) live in liner-moves.ts.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { countAdjustment, shortOfStock, reversalOf, type MoveDraft } from './liner-moves';
import { checkReceiptAgainst } from './purchase-orders.server';

const COLUMNS = [
  'lot_id',
  'site_id',
  'kind',
  'quantity',
  'occurred_at',
  'user_id',
  'asset_id',
  'scan_event_id',
  'hire_order_id',
  'folded_bins',
  'to_site_id',
  'sent_move_id',
  'reverses_move_id',
  'counted',
  'expected',
  'reason',
] as const;

async function rows<T extends object>(sql: string, bind: unknown[], t?: Transaction): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, transaction: t, type: QueryTypes.SELECT });
}

/** Inserts moves in one statement; returns their ids in order. A negative balance is a conflict, not a 500. */
export async function insertMoves(drafts: MoveDraft[], t: Transaction): Promise<number[]> {
  if (!drafts.length) return [];
  const bind: unknown[] = [];
  const values = drafts.map((d) => {
    const row = COLUMNS.map((c) => {
      bind.push((d as unknown as Record<string, unknown>)[c] ?? null);
      return `$${bind.length}`;
    });
    return `(${row.join(', ')})`;
  });
  try {
    const out = await rows<{ id: string }>(`INSERT INTO liner_moves (${COLUMNS.join(', ')}) VALUES ${values.join(', ')} RETURNING id`, bind, t);
    return out.map((r) => Number(r.id));
  } catch (e) {
    const constraint = (e as { parent?: { constraint?: string } }).parent?.constraint;
    if (constraint === 'liner_moves_never_negative') throw new AppError('conflict', 'Not enough liners of that lot at this depot.');
    throw e;
  }
}

export interface LockedLot {
  id: number;
  lotNumber: string;
  status: 'released' | 'on_hold' | 'recalled';
  expiryDate: string;
  siteId: number;
  linerSpecId: number | null;
  statusChangedAt: Date | null;
}

/** Locks the lot's row for the rest of the transaction (every taker of its liners queues here). */
export async function lockLot(lotId: number, t: Transaction): Promise<LockedLot | null> {
  const [lot] = await rows<LockedLot>(
    `SELECT id, lot_number AS "lotNumber", status, expiry_date AS "expiryDate", site_id AS "siteId", liner_spec_id AS "linerSpecId", status_changed_at AS "statusChangedAt" FROM liner_lots WHERE id = $1 FOR UPDATE`,
    [lotId],
    t,
  );
  return lot ?? null;
}

/** Liners of the lot on the shelf at the depot: the sum of its moves there. */
export async function onHand(lotId: number, siteId: number, t?: Transaction): Promise<number> {
  const [r] = await rows<{ n: number }>('SELECT COALESCE(sum(quantity), 0)::int AS n FROM liner_moves WHERE lot_id = $1 AND site_id = $2', [lotId, siteId], t);
  return r?.n ?? 0;
}

/** Locks the lot and refuses when the depot holds fewer than `wanted` of it. */
export async function takeFromLot(lotId: number, siteId: number, wanted: number, t: Transaction): Promise<{ lot: LockedLot; onHand: number }> {
  const lot = await lockLot(lotId, t);
  if (!lot) throw new AppError('unprocessable', 'That liner lot does not exist.');
  const have = await onHand(lotId, siteId, t);
  const short = shortOfStock(lot.lotNumber, have, wanted);
  if (short) throw new AppError('transition_refused', short, { reason: 'lot_empty', onHand: have });
  return { lot, onHand: have };
}

async function depot(siteId: number, t: Transaction): Promise<void> {
  const [s] = await rows<{ kind: string; active: boolean }>('SELECT kind, active FROM sites WHERE id = $1', [siteId], t);
  if (!s || !s.active || s.kind !== 'depot') throw new AppError('unprocessable', 'That is not an open depot.');
}

export interface Mover {
  id: number | null;
}

export interface ReceiptInput {
  supplier: string;
  lotNumber: string;
  spec: string;
  quantity: number;
  receivedOn: string;
  expiryDate: string;
  siteId: number;
  certificateId?: number | null;
  linerSpecId?: number | null;
  supplierId?: number | null;
  /** The purchase order it arrives against (its deliveries may close it), or none. */
  purchaseOrderId?: number | null;
  manufacturedOn?: string | null;
}

/** A lot arriving at a depot: the lot row and its receipt move, together (and the order it closes, if any). */
export async function receiveLot(
  who: Mover,
  input: ReceiptInput,
  opts: { transaction?: Transaction; now?: Date } = {},
): Promise<{ lotId: number; moveId: number; purchaseOrderClosed: boolean }> {
  return within(opts, async (t) => {
    await depot(input.siteId, t);
    const po = input.purchaseOrderId
      ? await checkReceiptAgainst(input.purchaseOrderId, { supplierId: input.supplierId ?? null, linerSpecId: input.linerSpecId ?? null, siteId: input.siteId }, t)
      : null;
    const existing = await rows<{ id: number }>('SELECT id FROM liner_lots WHERE supplier = $1 AND lot_number = $2', [input.supplier, input.lotNumber], t);
    if (existing.length) throw new AppError('duplicate', `Lot ${input.lotNumber} of ${input.supplier} is already received.`);
    const [lot] = await rows<{ id: number }>(
      `INSERT INTO liner_lots (supplier, lot_number, spec, quantity_received, received_on, expiry_date, site_id, certificate_id, liner_spec_id, supplier_id, purchase_order_id, manufactured_on)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12) RETURNING id`,
      [
        input.supplier,
        input.lotNumber,
        input.spec,
        input.quantity,
        input.receivedOn,
        input.expiryDate,
        input.siteId,
        input.certificateId ?? null,
        input.linerSpecId ?? null,
        input.supplierId ?? null,
        input.purchaseOrderId ?? null,
        input.manufacturedOn ?? null,
      ],
      t,
    );
    const [moveId] = await insertMoves(
      [{ lot_id: lot!.id, site_id: input.siteId, kind: 'receipt', quantity: input.quantity, occurred_at: opts.now ?? new Date(), user_id: who.id }],
      t,
    );
    const purchaseOrderClosed = po ? await po.close(opts.now ?? new Date()) : false;
    return { lotId: lot!.id, moveId: moveId!, purchaseOrderClosed };
  });
}

function within<T>(opts: { transaction?: Transaction }, run: (t: Transaction) => Promise<T>): Promise<T> {
  return opts.transaction ? sequelize.transaction({ transaction: opts.transaction }, run) : sequelize.transaction(run);
}

/** Liners leave a depot for another; they are in transit until the other depot books their arrival. */
export async function sendTransfer(
  who: Mover,
  input: { lotId: number; fromSiteId: number; toSiteId: number; quantity: number },
  opts: { transaction?: Transaction; now?: Date } = {},
): Promise<number> {
  if (input.fromSiteId === input.toSiteId) throw new AppError('validation_failed', 'A transfer goes to another depot.');
  return within(opts, async (t) => {
    await depot(input.toSiteId, t);
    await takeFromLot(input.lotId, input.fromSiteId, input.quantity, t);
    const [id] = await insertMoves(
      [
        {
          lot_id: input.lotId,
          site_id: input.fromSiteId,
          kind: 'sent',
          quantity: -input.quantity,
          to_site_id: input.toSiteId,
          occurred_at: opts.now ?? new Date(),
          user_id: who.id,
        },
      ],
      t,
    );
    return id!;
  });
}

/** The receiving depot books a transfer's arrival (all of it; a loss on the way is scrapped afterwards). */
export async function receiveTransfer(who: Mover, sentMoveId: number, opts: { transaction?: Transaction; now?: Date } = {}): Promise<number> {
  return within(opts, async (t) => {
    const [sent] = await rows<{ id: string; lot_id: number; to_site_id: number; quantity: number }>(
      `SELECT id, lot_id, to_site_id, quantity FROM liner_moves WHERE id = $1 AND kind = 'sent'`,
      [sentMoveId],
      t,
    );
    if (!sent) throw new AppError('not_found', 'No such transfer.');
    await lockLot(sent.lot_id, t);
    const [done] = await rows<{ id: string }>('SELECT id FROM liner_moves WHERE sent_move_id = $1', [sentMoveId], t);
    if (done) throw new AppError('conflict', 'This transfer has already arrived.');
    const [id] = await insertMoves(
      [
        {
          lot_id: sent.lot_id,
          site_id: sent.to_site_id,
          kind: 'arrived',
          quantity: -sent.quantity,
          sent_move_id: sentMoveId,
          occurred_at: opts.now ?? new Date(),
          user_id: who.id,
        },
      ],
      t,
    );
    return id!;
  });
}

/** Liner kits sent with folded bins on a hire order, for the customer to fit. */
export async function sendKits(
  who: Mover,
  input: { lotId: number; siteId: number; hireOrderId: number; quantity: number; foldedBins: number },
  opts: { transaction?: Transaction; now?: Date } = {},
): Promise<number> {
  return within(opts, async (t) => {
    await takeFromLot(input.lotId, input.siteId, input.quantity, t);
    const [id] = await insertMoves(
      [
        {
          lot_id: input.lotId,
          site_id: input.siteId,
          kind: 'kit_sent',
          quantity: -input.quantity,
          hire_order_id: input.hireOrderId,
          folded_bins: input.foldedBins,
          occurred_at: opts.now ?? new Date(),
          user_id: who.id,
        },
      ],
      t,
    );
    return id!;
  });
}

/** Liners off the shelf for good (torn cartons, expired, failed inspection), with the reason. */
export async function scrapLiners(
  who: Mover,
  input: { lotId: number; siteId: number; quantity: number; reason: string },
  opts: { transaction?: Transaction; now?: Date } = {},
): Promise<number> {
  if (!input.reason.trim()) throw new AppError('validation_failed', 'Say why the liners are scrapped.', { field: 'reason' });
  return within(opts, async (t) => {
    await takeFromLot(input.lotId, input.siteId, input.quantity, t);
    const [id] = await insertMoves(
      [{ lot_id: input.lotId, site_id: input.siteId, kind: 'scrapped', quantity: -input.quantity, reason: input.reason, occurred_at: opts.now ?? new Date(), user_id: who.id }],
      t,
    );
    return id!;
  });
}

/** A stock count of one lot at a depot: the difference to the ledger becomes an adjustment, both figures kept. */
export async function recordCount(
  who: Mover,
  input: { lotId: number; siteId: number; counted: number; note?: string | null },
  opts: { transaction?: Transaction; now?: Date } = {},
): Promise<{ moveId: number; counted: number; expected: number; quantity: number }> {
  return within(opts, async (t) => {
    const lot = await lockLot(input.lotId, t);
    if (!lot) throw new AppError('unprocessable', 'That liner lot does not exist.');
    let adj: ReturnType<typeof countAdjustment>;
    try {
      adj = countAdjustment(input.counted, await onHand(input.lotId, input.siteId, t));
    } catch (e) {
      throw new AppError('validation_failed', (e as Error).message, { field: 'counted' });
    }
    const [id] = await insertMoves(
      [{ lot_id: input.lotId, site_id: input.siteId, kind: 'counted', ...adj, reason: input.note ?? null, occurred_at: opts.now ?? new Date(), user_id: who.id }],
      t,
    );
    return { moveId: id!, ...adj };
  });
}

/** A voided scan's moves are reversed (a voided fit puts its liner back on the shelf). */
export async function reverseMovesOfEvents(eventIds: number[], userId: number | null, reason: string, at: Date, t: Transaction): Promise<number> {
  if (!eventIds.length) return 0;
  const moves = await rows<{ id: string; lot_id: number; site_id: number; quantity: number; asset_id: number | null }>(
    `SELECT m.id, m.lot_id, m.site_id, m.quantity, m.asset_id FROM liner_moves m
      WHERE m.scan_event_id = ANY($1::bigint[]) AND NOT EXISTS (SELECT 1 FROM liner_moves r WHERE r.reverses_move_id = m.id)
      ORDER BY m.id`,
    [eventIds],
    t,
  );
  for (const lotId of [...new Set(moves.map((m) => m.lot_id))].sort((a, b) => a - b)) await lockLot(lotId, t);
  await insertMoves(
    moves.map((m) => reversalOf({ ...m, id: Number(m.id) }, at, userId, reason)),
    t,
  );
  return moves.length;
}

export interface LotStock {
  lotId: number;
  lotNumber: string;
  supplier: string;
  spec: string;
  receivedOn: string;
  expiryDate: string;
  status: string;
  onHand: number;
}

/** Lots with liners on the shelf at a depot, first expiry first. */
export async function stockAt(siteId: number, t?: Transaction): Promise<LotStock[]> {
  return rows<LotStock>(
    `SELECT l.id AS "lotId", l.lot_number AS "lotNumber", l.supplier, l.spec, l.received_on AS "receivedOn", l.expiry_date AS "expiryDate", l.status, s.n AS "onHand"
       FROM (SELECT lot_id, sum(quantity)::int AS n FROM liner_moves WHERE site_id = $1 GROUP BY lot_id HAVING sum(quantity) > 0) s
       JOIN liner_lots l ON l.id = s.lot_id
      ORDER BY l.expiry_date, l.received_on, l.id`,
    [siteId],
    t,
  );
}

/** Liners sent to a depot and not yet booked in there, per lot. */
export async function inTransitTo(siteId: number, t?: Transaction): Promise<Array<{ sentMoveId: number; lotId: number; fromSiteId: number; quantity: number; sentAt: Date }>> {
  const out = await rows<{ id: string; lot_id: number; site_id: number; quantity: number; occurred_at: Date }>(
    `SELECT m.id, m.lot_id, m.site_id, m.quantity, m.occurred_at FROM liner_moves m
      WHERE m.kind = 'sent' AND m.to_site_id = $1 AND NOT EXISTS (SELECT 1 FROM liner_moves a WHERE a.sent_move_id = m.id)
      ORDER BY m.occurred_at`,
    [siteId],
    t,
  );
  return out.map((m) => ({ sentMoveId: Number(m.id), lotId: m.lot_id, fromSiteId: m.site_id, quantity: -m.quantity, sentAt: m.occurred_at }));
}
