// The demo pool in memory: the same checks and the same writes as recordScan()
// (src/lib/server/scan-service.ts) — the rule table decide() says yes or no,
// src/lib/scan/scan-effects.ts says what an allowed scan writes — applied to
// plain objects instead of rows, so eighteen months of history cost no round
// trips. bulk-write.ts then writes the result in a few multi-row inserts.
import { randomUUID } from 'node:crypto';
import { decide, checkLinerLot, type Action, type Status } from '@/lib/scans/lifecycle';
import { assetAfter, binState, logRows, tripChanges, tripOpening, type AssetSnapshot, type ScanSite } from '@/lib/scans/scan-effects';
import type { ScanInput, Actor, ScanOutcome } from '@/lib/scans/scan-service.server';
import { localDate } from '@/lib/calendar';
import { countsAsDemand, type OrderStatus } from '@/lib/planning/order-status';
import { LedgerBalance, movesForScan, shortOfStock, type MoveDraft } from '@/lib/liners/liner-moves';
import { specFitsBinType, type SpecFacts } from '@/lib/liners/liner-specs';

export interface SimAsset extends AssetSnapshot {
  id: number;
  grai: string;
  serial: string;
  binTypeId: number;
  manufactureMonth: string; // YYYY-MM-01
  unMarking: string | null;
  lastInspectionOn: string | null;
  lastLeakTestOn: string | null;
  lastFullInspectionOn: string | null;
  nextIntermediateDue: string | null;
  nextFullDue: string | null;
  nextDue: string | null;
  version: number;
}

/** A trip with its SQL column names (what tripChanges() sets). */
export interface SimTrip {
  id: number;
  asset_id: number;
  hire_order_id: number | null;
  customer_id: number;
  depot_site_id: number;
  customer_site_id: number | null;
  discharge_site_id: number | null;
  closing_site_id: number | null;
  liner_lot_id: number | null;
  load_id: number | null;
  dispatched_at: Date;
  delivered_at: Date | null;
  filled_at: Date | null;
  discharged_at: Date | null;
  collected_at: Date | null;
  returned_at: Date | null;
  fill_product: string | null;
  fill_volume_l: number | null;
  fill_mass_kg: number | null;
  fill_temperature_c: number | null;
  seals_applied: string[];
  seals_verified: string[];
  seal_mismatch: boolean;
  status: 'open' | 'closed';
  version: number;
}

export interface SimEvent {
  id: number;
  asset_id: number;
  action: Action;
  occurred_at: Date;
  site_id: number | null;
  user_id: number | null;
  client_event_id: string | null;
  status_from: Status | null;
  status_to: Status;
  trip_id: number | null;
  inferred: boolean;
  flagged: boolean;
  payload: Record<string, unknown>;
}

export interface SimOrder {
  id: number;
  reference: string;
  customer_id: number;
  delivery_site_id: number;
  depot_site_id: number;
  bin_type_id: number;
  quantity: number;
  needed_by: string;
  status: OrderStatus;
  product: string | null;
}

export interface SimLot {
  id: number;
  supplier: string;
  lot_number: string;
  spec: string;
  quantity_received: number;
  received_on: string;
  expiry_date: string;
  site_id: number;
  status: 'released' | 'on_hold' | 'recalled';
  liner_spec_id: number | null;
  supplier_id: number | null;
}

export interface SimSite extends ScanSite {
  active: boolean;
}

/** A refusal the scan service would answer with (its AppError code and the rule's reason code). */
export class SimRefusal extends Error {
  constructor(
    readonly code: 'transition_refused' | 'not_found' | 'forbidden' | 'unprocessable' | 'validation_failed',
    readonly reason: string,
    message: string,
  ) {
    super(message);
  }
}

/** Ids handed out in memory, starting where each table's sequence stands. */
export class IdSource {
  private next: Record<string, number>;
  constructor(starts: Record<string, number>) {
    this.next = { ...starts };
  }
  take(table: string): number {
    const id = this.next[table]!;
    this.next[table] = id + 1;
    return id;
  }
}

export class PoolSim {
  readonly assets = new Map<number, SimAsset>();
  readonly trips = new Map<number, SimTrip>();
  readonly events: SimEvent[] = [];
  readonly keys: Array<{ client_event_id: string; user_id: number | null; scan_event_id: number; outcome: ScanOutcome }> = [];
  readonly orders = new Map<number, SimOrder>();
  readonly lots = new Map<number, SimLot>();
  /** The liner ledger (liner_moves rows) and its running balance per lot and depot. */
  readonly moves: MoveDraft[] = [];
  readonly ledger = new LedgerBalance();
  /** Liner specs, and the specs each bin type lists with its name (the fit check's inputs). */
  readonly specs = new Map<number, SpecFacts>();
  readonly binTypes = new Map<number, { name: string; listed: SpecFacts[] }>();

  constructor(
    readonly ids: IdSource,
    readonly sites: Map<number, SimSite>,
    readonly timeZone: string,
  ) {}

  /** The scan service's recordScan(), on the in-memory pool. Throws SimRefusal where it would refuse. */
  recordScan(actor: Actor, input: ScanInput): ScanOutcome {
    const occurredAt = input.occurredAt!;
    const asset = this.assets.get(input.assetId);
    if (!asset) throw new SimRefusal('not_found', 'not_found', 'No bin with that identity is registered.');
    if (actor.role === 'customer' && asset.customerId !== actor.organisationId) {
      throw new SimRefusal('not_found', 'not_found', 'No bin with that identity is on hire to your organisation.');
    }
    const site = this.scanSite(actor, input);
    const today = localDate(occurredAt, this.timeZone);
    const siteKind = asset.siteId === null ? null : (this.sites.get(asset.siteId)?.kind ?? null);
    const decision = decide(binState(asset, siteKind, asset.nextDue), input.action, {
      role: actor.role,
      today,
      siteId: site ? String(site.id) : null,
      siteKind: site ? site.kind : null,
      prepResult: input.prepResult,
      linerLotId: input.linerLotId === undefined ? undefined : String(input.linerLotId),
      purpose: input.purpose,
      inspection: input.inspectionResult,
    });
    if (!decision.ok) throw new SimRefusal('transition_refused', decision.code, decision.reason);
    const { order, lotNumber } = this.checkActionInputs(asset, input, site, today);

    const flags = [...decision.flags];
    let opened: { tripId: number; customerId: number } | null = null;
    let tripId: number | null = null;
    if (decision.trip === 'open') {
      const o = tripOpening(
        asset,
        input,
        site,
        order ? { id: order.id, customerId: order.customer_id, depotSiteId: order.depot_site_id, deliverySiteId: order.delivery_site_id } : null,
        occurredAt,
      );
      if (!o.customerId) throw new SimRefusal('transition_refused', 'no_hire_order', 'Choose the hire order this bin goes out on.');
      const trip: SimTrip = {
        id: this.ids.take('trips'),
        asset_id: asset.id,
        hire_order_id: o.hireOrderId,
        customer_id: o.customerId,
        depot_site_id: o.depotSiteId,
        customer_site_id: o.customerSiteId,
        discharge_site_id: null,
        closing_site_id: null,
        liner_lot_id: o.linerLotId,
        load_id: o.loadId,
        dispatched_at: o.dispatchedAt,
        delivered_at: o.deliveredAt,
        filled_at: null,
        discharged_at: null,
        collected_at: null,
        returned_at: null,
        fill_product: null,
        fill_volume_l: null,
        fill_mass_kg: null,
        fill_temperature_c: null,
        seals_applied: [],
        seals_verified: [],
        seal_mismatch: false,
        status: 'open',
        version: 0,
      };
      this.trips.set(trip.id, trip);
      opened = { tripId: trip.id, customerId: o.customerId };
      tripId = trip.id;
    } else if (decision.trip !== 'none' && asset.currentTripId !== null) {
      const trip = this.trips.get(asset.currentTripId)!;
      const change = tripChanges(input, decision, site, trip.seals_applied, occurredAt);
      flags.push(...change.flags);
      Object.assign(trip, change.set);
      if (change.close) trip.status = 'closed';
      trip.version += 1;
      tripId = trip.id;
    }
    const eventTripId = tripId ?? asset.currentTripId;

    const named = { ...(lotNumber ? { lotNumber } : {}), ...(order ? { orderRef: order.reference } : {}) };
    let eventId = 0;
    for (const r of logRows(input, occurredAt, asset.status, decision, flags, named)) {
      eventId = this.ids.take('scan_events');
      this.events.push({
        id: eventId,
        asset_id: asset.id,
        action: r.action,
        occurred_at: r.occurredAt,
        site_id: site?.id ?? null,
        user_id: actor.id,
        client_event_id: r.clientEventId,
        status_from: r.statusFrom,
        status_to: r.statusTo,
        trip_id: eventTripId,
        inferred: r.inferred,
        flagged: r.flagged,
        payload: r.payload,
      });
    }
    const before = { ...asset };
    Object.assign(asset, assetAfter(asset, decision, opened, occurredAt));
    const schedule = decision.patch.schedule;
    if (schedule) Object.assign(asset, schedule); // the same six columns recordScan() writes (scheduleColumns)
    asset.version += 1;
    for (const m of movesForScan({ action: input.action, before, after: asset, assetId: asset.id, siteId: site?.id ?? null, userId: actor.id, occurredAt })) {
      this.addMove({ ...m, scan_event_id: eventId });
    }
    const outcome: ScanOutcome = {
      clientEventId: input.clientEventId,
      replayed: false,
      eventId,
      assetId: asset.id,
      grai: asset.grai,
      action: input.action,
      statusFrom: decision.from,
      statusTo: decision.to,
      inferred: decision.inferred,
      flags,
      tripId: eventTripId,
      version: asset.version,
    };
    this.keys.push({ client_event_id: input.clientEventId, user_id: actor.id, scan_event_id: eventId, outcome });
    return outcome;
  }

  /** A lot arriving at its depot: the lot and its receipt move (liner-ledger.server.ts receiveLot()). */
  receiveLot(lot: SimLot, at: Date): void {
    this.lots.set(lot.id, lot);
    this.addMove({ lot_id: lot.id, site_id: lot.site_id, kind: 'receipt', quantity: lot.quantity_received, occurred_at: at, user_id: null });
  }

  /** Liners of the lot on the shelf at the depot. */
  onHand(lotId: number, siteId: number): number {
    return this.ledger.onHand(lotId, siteId);
  }

  private addMove(m: MoveDraft): void {
    this.ledger.apply(m);
    this.moves.push(m);
  }

  /** A scan input with a fresh client event id, as a phone would make it. */
  static input(fields: Omit<ScanInput, 'clientEventId'>): ScanInput {
    return { clientEventId: randomUUID(), ...fields };
  }

  private scanSite(actor: Actor, input: ScanInput): SimSite | null {
    const siteId = input.siteId === undefined ? (actor.role === 'yard' ? actor.homeSiteId : null) : input.siteId;
    if (siteId === null || siteId === undefined) return null;
    const site = this.sites.get(siteId);
    if (!site || !site.active) throw new SimRefusal('unprocessable', 'unprocessable', 'That site does not exist or is closed.');
    if (actor.role === 'customer' && site.organisationId !== actor.organisationId) {
      throw new SimRefusal('forbidden', 'forbidden', 'You can record scans only at your own sites.');
    }
    return site;
  }

  private checkActionInputs(asset: SimAsset, input: ScanInput, site: SimSite | null, today: string): { order: SimOrder | null; lotNumber: string | null } {
    let lotNumber: string | null = null;
    if (input.action === 'fit_liner') {
      const lot = input.linerLotId === undefined ? undefined : this.lots.get(input.linerLotId);
      if (!lot) throw new SimRefusal('unprocessable', 'unprocessable', 'That liner lot does not exist.');
      const ok = checkLinerLot({ status: lot.status, expiryDate: lot.expiry_date, lotNumber: lot.lot_number }, today);
      if (!ok.ok) throw new SimRefusal('transition_refused', ok.code, ok.reason);
      const type = this.binTypes.get(asset.binTypeId);
      const fit = specFitsBinType(lot.liner_spec_id === null ? null : (this.specs.get(lot.liner_spec_id) ?? null), type?.name ?? 'this bin type', type?.listed ?? []);
      if (!fit.ok) throw new SimRefusal('transition_refused', fit.code, fit.reason);
      const short = shortOfStock(lot.lot_number, this.onHand(lot.id, (site?.id ?? asset.siteId)!), 1);
      if (short) throw new SimRefusal('transition_refused', 'lot_empty', short);
      lotNumber = lot.lot_number;
    }
    if (input.action === 'fill_seal' && !input.fill) throw new SimRefusal('validation_failed', 'validation_failed', 'Record the product, the quantity and the seal numbers.');
    if (!input.hireOrderId) {
      if (input.action === 'dispatch' && (input.purpose ?? 'hire') === 'hire') {
        throw new SimRefusal('transition_refused', 'no_hire_order', 'Choose the hire order this bin goes out on.');
      }
      return { order: null, lotNumber };
    }
    const order = this.orders.get(input.hireOrderId);
    if (!order || !countsAsDemand(order.status)) throw new SimRefusal('transition_refused', 'order_not_open', 'That hire order is not open for loading.');
    if (order.bin_type_id !== asset.binTypeId) throw new SimRefusal('transition_refused', 'wrong_bin_type', `Hire order ${order.reference} asks for another bin type.`);
    return { order, lotNumber };
  }
}
