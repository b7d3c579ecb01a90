// Eighteen months of invented pool history. Every scan goes through the same
// checks and the same rule table as the yards' (decide(), applied by PoolSim in
// pool-sim.ts the way recordScan() applies it), on an in-memory pool; the
// result is written in bulk (bulk-write.ts), so the bins' current state and the
// event log agree by construction. Deterministic: a seeded PRNG.
import type { Transaction } from 'sequelize';
import { BinType, Organisation, Site, User } from '@/models';
import type { Actor, ScanInput } from '@/lib/scans/scan-service.server';
import { checkedOrThrow, newAssetRow, registerEventRow } from '@/lib/bins/bin-register.server';
import { makeGrai } from '@/lib/gs1';
import { scheduleAfterTest } from '@/lib/inspections/schedule-after';
import { CHECKLIST } from '@/lib/inspections/inspection-form';
import { policyForBinType } from '@/lib/bins/bin-policy';
import { addDays, addMonthsToMonth, localDate } from '@/lib/calendar';
import { seededRandom, type Random } from '@/lib/random';
import { PoolSim, SimRefusal, type SimAsset, type SimLot, type SimOrder } from './pool-sim';
import { nextIds, writePool, type SimInspection } from './bulk-write';
import { CUSTOMERS, OPERATOR, PRODUCTS, LINER_SUPPLIERS } from './scenario';
import { seedLinerRecords, type LinerRecords } from './liner-records';
import { seedRepairOrders } from './repair-records';

const DAY = 86_400_000;
const HOUR = 3_600_000;

interface World {
  now: Date;
  start: Date;
  rnd: Random;
  planner: Actor;
  yardByDepot: Map<number, Actor>;
  customerActor: Map<number, Actor>; // customers with a portal user act themselves
  depots: Site[];
  customers: Array<{ org: Organisation; filling: Site; receiving: Site; homeDepot: Site; slowPayer: boolean }>;
  types: BinType[];
  lots: SimLot[];
  orders: Map<string, SimOrder>;
  inspections: SimInspection[];
  pool: PoolSim;
  liners: LinerRecords;
  stats: Record<string, number>;
}

function actorOf(u: User): Actor {
  return { id: u.id, role: u.role, organisationId: u.organisationId, homeSiteId: u.homeSiteId };
}

/**
 * Generates the pool, its history and the open orders of the coming weeks, and
 * writes them inside the caller's transaction.
 */
export async function generateHistory(opts: { bins: number; months: number; now?: Date; seed?: number; transaction: Transaction }) {
  const now = opts.now ?? new Date();
  const rnd = seededRandom(opts.seed ?? 20261201);
  const start = new Date(now.getTime() - opts.months * 30.44 * DAY);
  const t0 = Date.now();
  const world = await loadWorld(now, start, rnd, opts.transaction);
  const { pool } = world;
  createLinerLots(world);

  // Register the pool: most bins were there before the window, a tenth joined during it.
  const plans: Array<{ asset: SimAsset; joined: Date; depot: Site }> = [];
  let serial = 0;
  for (let i = 0; i < opts.bins; i++) {
    const type = rnd.chance(0.7) ? world.types[0]! : world.types[1]!;
    const depot = rnd.pick(world.depots);
    const joined = rnd.chance(0.9) ? start : new Date(start.getTime() + rnd.int(30, Math.max(31, (now.getTime() - start.getTime()) / DAY - 60)) * DAY);
    const made = manufactureMonthFor(rnd, joined);
    const lastTest = testHistoryFor(rnd, made, joined, type);
    serial += 1;
    const grai = makeGrai(OPERATOR.gs1CompanyPrefix, type.graiAssetType, String(100000 + serial));
    const input = {
      grai,
      binTypeId: type.id,
      siteId: depot.id,
      manufactureMonth: made,
      unMarking: type.unCode ? `${type.unCode}/Y/${made.slice(5, 7)} ${made.slice(2, 4)}/NL/NMP 4417/2313/${Number(type.maxGrossKg)}` : null,
      lastIntermediateTestMonth: lastTest,
    };
    // The same row and first log entry registerBin() writes.
    const row = newAssetRow(checkedOrThrow(input, OPERATOR.gs1PrefixLength), input, type, depot.id, joined);
    const asset: SimAsset = {
      id: pool.ids.take('assets'),
      grai: row.grai,
      serial: row.serial,
      binTypeId: row.binTypeId,
      manufactureMonth: row.manufactureMonth,
      unMarking: row.unMarking,
      status: row.status,
      siteId: row.siteId,
      siteSince: row.siteSince,
      customerId: null,
      currentTripId: null,
      leg: null,
      prepChecked: false,
      linerLotId: null,
      filled: false,
      tripCount: 0,
      lastScanAt: row.lastScanAt,
      lastInspectionOn: row.lastInspectionOn,
      lastLeakTestOn: row.lastLeakTestOn,
      lastFullInspectionOn: row.lastFullInspectionOn,
      nextIntermediateDue: row.nextIntermediateDue,
      nextFullDue: row.nextFullDue,
      nextDue: row.nextDue,
      version: 0,
    };
    pool.assets.set(asset.id, asset);
    const ev = registerEventRow(asset.id, depot.id, world.planner, joined);
    pool.events.push({
      id: pool.ids.take('scan_events'),
      asset_id: asset.id,
      action: 'register',
      occurred_at: joined,
      site_id: depot.id,
      user_id: ev.userId,
      client_event_id: null,
      status_from: null,
      status_to: 'available',
      trip_id: null,
      inferred: false,
      flagged: false,
      payload: ev.payload,
    });
    plans.push({ asset, joined, depot });
  }

  // Each bin lives its own cycles, one after the other (no I/O, so no reason to interleave).
  for (const p of plans) liveBin(world, p.asset, p.depot, p.joined);

  closePastOrders(world);
  openComingOrders(world);
  const t1 = Date.now();
  const written = await writePool(pool, world.inspections, opts.transaction);
  count(world, 'events_written', written.events);
  count(world, 'repair_orders', await seedRepairOrders(opts.transaction));
  console.log(`[seed] history: ${written.events} log entries generated in ${((t1 - t0) / 1000).toFixed(1)} s, written in ${((Date.now() - t1) / 1000).toFixed(1)} s`);
  return world.stats;
}

async function loadWorld(now: Date, start: Date, rnd: Random, transaction: Transaction): Promise<World> {
  const depots = await Site.findAll({ where: { kind: 'depot' }, order: [['id', 'ASC']], transaction });
  const users = await User.findAll({ transaction });
  const planner = users.find((u) => u.role === 'planner')!;
  const yardByDepot = new Map<number, Actor>();
  for (const d of depots) {
    const yard = users.find((u) => u.role === 'yard' && u.homeSiteId === d.id);
    yardByDepot.set(d.id, yard ? actorOf(yard) : actorOf(planner));
  }
  const customerActor = new Map<number, Actor>();
  for (const u of users.filter((u) => u.role === 'customer')) customerActor.set(u.organisationId, actorOf(u));
  const orgs = await Organisation.findAll({ where: { kind: 'customer' }, transaction });
  const sites = await Site.findAll({ where: { kind: 'customer' }, transaction });
  const customers = CUSTOMERS.map((c, i) => {
    const org = orgs.find((o) => o.name === c.name)!;
    const filling = sites.find((s) => s.code === c.sites.find((x) => x.role === 'filling')!.code)!;
    const receivingDef = c.sites.find((x) => x.role === 'receiving') ?? c.sites[0]!;
    const receiving = sites.find((s) => s.code === receivingDef.code)!;
    return { org, filling, receiving, homeDepot: depots.find((d) => d.code === c.homeDepot)!, slowPayer: i === 3 || i === 5 };
  });
  const types = await BinType.findAll({ order: [['id', 'ASC']], transaction });
  const allSites = await Site.findAll({ transaction });
  const simSites = new Map(allSites.map((s) => [s.id, { id: s.id, kind: s.kind as 'depot', organisationId: s.organisationId, active: s.active }]));
  const ids = await nextIds(['assets', 'trips', 'scan_events', 'hire_orders', 'liner_lots', 'inspections'], transaction);
  const pool = new PoolSim(ids, simSites, OPERATOR.timeZone);
  const liners = await seedLinerRecords(types, transaction);
  for (const [id, f] of liners.specs) pool.specs.set(id, f);
  for (const t of types) pool.binTypes.set(t.id, { name: t.name, listed: liners.listed.get(t.id) ?? [] });
  return {
    now,
    start,
    rnd,
    planner: actorOf(planner),
    yardByDepot,
    customerActor,
    depots,
    customers,
    types,
    lots: [],
    orders: new Map(),
    inspections: [],
    pool,
    liners,
    stats: {},
  };
}

function count(world: World, key: string, n = 1) {
  world.stats[key] = (world.stats[key] ?? 0) + n;
}

function ym(date: Date): string {
  return date.toISOString().slice(0, 7);
}

/** Bins were made 0–4 years before they joined the pool window. */
function manufactureMonthFor(rnd: Random, joined: Date): string {
  return addMonthsToMonth(ym(joined), -rnd.int(0, 48));
}

/**
 * A last 2.5-year test month consistent with the bin's age at the start: bins
 * past 30 months had one; the spread makes some fall due during the window
 * and some just after it (the due list has work in it).
 */
function testHistoryFor(rnd: Random, made: string, joined: Date, type: BinType): string | null {
  const ageMonths = monthsBetween(made, ym(joined));
  if (ageMonths < type.intermediateMonths) return null;
  const sinceTest = rnd.int(0, type.intermediateMonths - 6);
  const m = addMonthsToMonth(ym(joined), -sinceTest);
  return m < made ? made : m;
}

function monthsBetween(a: string, b: string): number {
  const [ay, am] = a.split('-').map(Number) as [number, number];
  const [by, bm] = b.split('-').map(Number) as [number, number];
  return (by - ay) * 12 + (bm - am);
}

function createLinerLots(world: World) {
  const { rnd } = world;
  let n = 0;
  for (const depot of world.depots) {
    // A lot every ~2 months, 24 months' shelf life from receipt.
    for (let t = world.start.getTime() - 120 * DAY; t < world.now.getTime(); t += rnd.int(50, 70) * DAY) {
      n += 1;
      const supplier = LINER_SUPPLIERS[n % LINER_SUPPLIERS.length]!;
      const received = localDate(new Date(t), OPERATOR.timeZone);
      const expiry = localDate(new Date(t + rnd.int(600, 760) * DAY), OPERATOR.timeZone);
      const lot: SimLot = {
        id: world.pool.ids.take('liner_lots'),
        supplier: supplier.name,
        lot_number: `${supplier.prefix}${received.slice(2, 4)}${received.slice(5, 7)}-${String(n).padStart(3, '0')}`,
        spec: supplier.spec,
        quantity_received: rnd.pick([300, 400, 500]),
        received_on: received,
        expiry_date: expiry,
        site_id: depot.id,
        status: 'released',
        ...linerIds(world, supplier.name),
      };
      world.lots.push(lot);
      world.pool.receiveLot(lot, new Date(t));
    }
  }
}

/**
 * First-expiry-first-out among lots received at the depot by that date, usable then and with liners left.
 * Bins live one after another, so early lots are drained by the first bins' whole lives; when every lot
 * on hand is used up, the depot takes an urgent delivery that day (no random draw: the rest of the history
 * stays as it was).
 */
function lotFor(world: World, depotId: number, at: Date): SimLot | null {
  const day = localDate(at, OPERATOR.timeZone);
  const usable = world.lots.filter((l) => l.site_id === depotId && l.received_on <= day && l.expiry_date >= day && l.status === 'released');
  if (!usable.length) return null;
  const inStock = usable.filter((l) => world.pool.onHand(l.id, depotId) > 0);
  inStock.sort((a, b) => a.expiry_date.localeCompare(b.expiry_date));
  return inStock[0] ?? urgentLot(world, depotId, at);
}

function linerIds(world: World, supplierName: string): Pick<SimLot, 'liner_spec_id' | 'supplier_id'> {
  const r = world.liners.bySupplier.get(supplierName)!;
  return { liner_spec_id: r.specId, supplier_id: r.supplierId };
}

function urgentLot(world: World, depotId: number, at: Date): SimLot {
  const n = world.lots.length + 1;
  const supplier = LINER_SUPPLIERS[n % LINER_SUPPLIERS.length]!;
  const received = localDate(at, OPERATOR.timeZone);
  const lot: SimLot = {
    id: world.pool.ids.take('liner_lots'),
    supplier: supplier.name,
    lot_number: `${supplier.prefix}${received.slice(2, 4)}${received.slice(5, 7)}-U${String(n).padStart(3, '0')}`,
    spec: supplier.spec,
    quantity_received: 400,
    received_on: received,
    expiry_date: addDays(received, 700),
    site_id: depotId,
    status: 'released',
    ...linerIds(world, supplier.name),
  };
  world.lots.push(lot);
  world.pool.receiveLot(lot, at);
  return lot;
}

function orderFor(world: World, customer: World['customers'][number], depot: Site, type: BinType, at: Date): SimOrder {
  const week = Math.floor(at.getTime() / (7 * DAY));
  const key = `${customer.org.id}:${depot.id}:${type.id}:${week}`;
  const known = world.orders.get(key);
  if (known) {
    known.quantity += 1;
    return known;
  }
  const n = world.orders.size + 1;
  const order: SimOrder = {
    id: world.pool.ids.take('hire_orders'),
    reference: `HO-${localDate(at, OPERATOR.timeZone).slice(2, 7).replace('-', '')}-${String(n).padStart(4, '0')}`,
    customer_id: customer.org.id,
    delivery_site_id: customer.filling.id,
    depot_site_id: depot.id,
    bin_type_id: type.id,
    quantity: 1,
    needed_by: localDate(new Date(at.getTime() + 2 * DAY), OPERATOR.timeZone),
    status: 'loading',
    product: PRODUCTS[customer.org.name] ?? null,
  };
  world.orders.set(key, order);
  world.pool.orders.set(order.id, order);
  return order;
}

/** One bin's life from `joined` until now. */
function liveBin(world: World, bin: SimAsset, homeDepot: Site, joined: Date) {
  const { rnd, now } = world;
  const assetId = bin.id;
  const binType = world.types.find((ty) => ty.id === bin.binTypeId)!;
  let t = joined.getTime() + rnd.int(1, 8) * HOUR;
  let depot = homeDepot;

  const scan = (actor: Actor, input: Omit<ScanInput, 'clientEventId' | 'assetId' | 'occurredAt'>, at: number): boolean => {
    if (at > now.getTime()) return false;
    try {
      world.pool.recordScan(actor, PoolSim.input({ assetId, occurredAt: new Date(at), ...input }));
      count(world, input.action);
      return true;
    } catch (e) {
      if (e instanceof SimRefusal && e.code === 'transition_refused') {
        count(world, `refused:${e.reason}`);
        return false;
      }
      throw e;
    }
  };
  const later = (minDays: number, maxDays: number) => (t += rnd.int(minDays * 24, maxDays * 24) * HOUR + rnd.int(0, 59) * 60_000);

  while (t < now.getTime()) {
    const yard = world.yardByDepot.get(depot.id)!;
    // Waiting folded at the depot until an order needs it (the pool carries some slack).
    later(4, 36);
    keepTestInDate(world, bin, t, yard);
    const pass = !rnd.chance(0.04);
    if (!scan(yard, { action: 'prep_check', siteId: depot.id, prepResult: pass ? 'pass' : 'fail', checklist: prepChecklist(pass), faults: pass ? undefined : rnd.pick(FAULTS) }, t))
      return;
    if (!pass) {
      count(world, 'quarantined');
      if (rnd.chance(0.05)) {
        later(3, 10);
        scan(world.planner, { action: 'retire', siteId: depot.id, note: 'Beyond economic repair.' }, t);
        return;
      }
      later(1, 5);
      if (!scan(yard, { action: 'send_to_repair', siteId: depot.id }, t)) return;
      later(4, 14);
      if (!scan(world.planner, { action: 'release', siteId: null, note: 'Repaired and retested.' }, t)) return;
      continue;
    }
    later(0, 1);
    const lot = lotFor(world, depot.id, new Date(t));
    if (!lot || !scan(yard, { action: 'fit_liner', siteId: depot.id, linerLotId: lot.id }, t)) return;

    const customer = rnd.chance(0.75) ? rnd.pick(world.customers.filter((c) => c.homeDepot.id === depot.id).concat(world.customers)) : rnd.pick(world.customers);
    later(0, 4);
    const order = orderFor(world, customer, depot, binType, new Date(t));
    if (!scan(yard, { action: 'dispatch', siteId: depot.id, purpose: 'hire', hireOrderId: order.id }, t)) return;

    const driver = world.yardByDepot.get(customer.homeDepot.id)!;
    const customerActor = world.customerActor.get(customer.org.id) ?? world.planner;
    later(0, 2);
    const skipDeliver = rnd.chance(0.03);
    if (!skipDeliver && !scan(driver, { action: 'deliver', siteId: customer.filling.id }, t)) return;
    later(1, 6);
    const product = PRODUCTS[customer.org.name] ?? 'Vegetable oil';
    const volume = rnd.int(880, 960);
    const fill = { product, volumeL: volume, massKg: Math.round(volume * 0.92), temperatureC: rnd.int(8, 24), seals: [sealNumber(rnd), sealNumber(rnd)] };
    if (!scan(customerActor, { action: 'fill_seal', siteId: customer.filling.id, fill }, t)) return;

    // With the customer: discharged at the receiving site, folded, waiting for the haulier.
    const slow = customer.slowPayer && rnd.chance(0.35);
    later(4, slow ? 45 : 24);
    if (rnd.chance(0.003)) {
      later(60, 120);
      scan(world.planner, { action: 'mark_missing', siteId: null, note: 'Not seen for months; customer cannot find it.' }, t);
      count(world, 'went_missing');
      return;
    }
    const seals = rnd.chance(0.01) ? [fill.seals[0]!, sealNumber(rnd)] : fill.seals;
    if (!scan(customerActor, { action: 'discharge', siteId: customer.receiving.id, sealsVerified: seals }, t)) return;
    later(0, 2);
    if (!scan(customerActor, { action: 'fold', siteId: customer.receiving.id }, t)) return;
    later(3, slow ? 30 : 14);
    const skipCollect = rnd.chance(0.1); // the haulier forgot to scan; the depot infers it
    if (!skipCollect && !scan(driver, { action: 'collect', siteId: customer.receiving.id }, t)) return;
    later(1, 3);
    depot = rnd.chance(0.85) ? customer.homeDepot : rnd.pick(world.depots);
    if (!scan(world.yardByDepot.get(depot.id)!, { action: 'receive', siteId: depot.id }, t)) return;
  }
}

/** Books and passes the periodic test when it falls due within the next three weeks (the yard would), through the scan log like any test. */
function keepTestInDate(world: World, asset: SimAsset, at: number, inspector: Actor) {
  if (at > world.now.getTime()) return; // the wait ran past today: no test on a day that has not come yet
  const today = localDate(new Date(at), OPERATOR.timeZone);
  const soon = localDate(new Date(at + 21 * DAY), OPERATOR.timeZone);
  if (!asset.nextDue || asset.nextDue > soon || asset.status !== 'available') return;
  // Most are tested in time; a few slip past their date and wait for the booking.
  if (asset.nextDue < today && world.rnd.chance(0.15)) return;
  const type = world.types.find((ty) => ty.id === asset.binTypeId)!;
  const full = asset.nextFullDue !== null && asset.nextFullDue <= soon;
  const kind = full ? ('full' as const) : ('intermediate' as const);
  const leakTest = { pressureKpa: 20, minutes: 10, passed: true };
  const { schedule } = scheduleAfterTest(asset, { kind, outcome: 'pass', leakTest, performedOn: today }, policyForBinType(type));
  let eventId: number;
  try {
    eventId = world.pool.recordScan(
      inspector,
      PoolSim.input({
        assetId: asset.id,
        action: 'inspect',
        siteId: asset.siteId,
        occurredAt: new Date(at),
        inspection: { kind, outcome: 'pass', leakTest },
        inspectionResult: { kind, outcome: 'pass', scheduleAfter: schedule },
      }),
    ).eventId;
  } catch (e) {
    if (e instanceof SimRefusal) return;
    throw e;
  }
  world.inspections.push({
    id: world.pool.ids.take('inspections'),
    asset_id: asset.id,
    kind,
    performed_on: today,
    inspector_id: inspector.id,
    site_id: asset.siteId,
    checklist: Object.fromEntries(CHECKLIST[kind].map((i) => [i.key, true])),
    leak_test_pressure_kpa: '20',
    leak_test_minutes: '10',
    leak_test_passed: true,
    outcome: 'pass',
    next_intermediate_due: asset.nextIntermediateDue,
    next_full_due: asset.nextFullDue,
    scan_event_id: eventId,
    recorded_by: inspector.id,
  });
  count(world, full ? 'full_tests' : 'intermediate_tests');
}

const FAULTS = ['Cracked floor panel', 'Bent side-wall lock', 'Discharge port seat damaged', 'Sharp edge on inner wall', 'Label unreadable'];

function prepChecklist(pass: boolean): Record<string, boolean> {
  return { panelsAndLocks: pass, floorAndWalls: pass, dischargePort: true, lidAndSealHoles: true, labelLegible: true };
}

function sealNumber(rnd: Random): string {
  return `TE${rnd.int(1000000, 9999999)}`;
}

function closePastOrders(world: World) {
  const today = localDate(world.now, OPERATOR.timeZone);
  for (const o of world.pool.orders.values()) {
    if (o.needed_by < today) o.status = 'closed';
    else if (o.status === 'loading') o.status = 'dispatched';
  }
}

/** Orders for the coming three weeks, so depots have bins to prepare. */
function openComingOrders(world: World) {
  const { rnd } = world;
  let n = 0;
  for (const c of world.customers) {
    for (let k = 0; k < 2; k++) {
      n += 1;
      const needed = new Date(world.now.getTime() + rnd.int(2, 21) * DAY);
      const order: SimOrder = {
        id: world.pool.ids.take('hire_orders'),
        reference: `HO-${localDate(needed, OPERATOR.timeZone).slice(2, 7).replace('-', '')}-N${String(n).padStart(3, '0')}`,
        customer_id: c.org.id,
        delivery_site_id: c.filling.id,
        depot_site_id: c.homeDepot.id,
        bin_type_id: world.types[k % 2]!.id,
        quantity: rnd.pick([12, 20, 24, 24, 30, 40]),
        needed_by: localDate(needed, OPERATOR.timeZone),
        status: 'confirmed',
        product: PRODUCTS[c.org.name] ?? null,
      };
      world.pool.orders.set(order.id, order);
    }
  }
  count(world, 'open_orders', n);
}
