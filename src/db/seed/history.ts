// Eighteen months of invented pool history, generated through the same scan
// service the yards use (src/lib/scans/scan-service.server.ts), so the bins' current
// state and the event log agree by construction. Deterministic: a seeded PRNG.
import { randomUUID } from 'node:crypto';
import { Op } from 'sequelize';
import { sequelize, Asset, BinType, HireOrder, Inspection, LinerLot, Organisation, Site, User } from '@/models';
import { recordScan, type Actor, type ScanInput } from '@/lib/scans/scan-service.server';
import { registerBin } from '@/lib/bins/bin-register.server';
import { makeGrai } from '@/lib/gs1';
import { nextDue } from '@/lib/inspections/inspection-due';
import { policyForBinType } from '@/lib/bins/bin-policy';
import { addMonthsToMonth, localDate } from '@/lib/calendar';
import { seededRandom, type Random } from '@/lib/random';
import { AppError } from '@/lib/api-errors';
import { CUSTOMERS, OPERATOR, PRODUCTS, LINER_SUPPLIERS } from './scenario';

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
  lots: LinerLot[];
  orders: Map<string, Promise<HireOrder>>;
  stats: Record<string, number>;
}

function actorOf(u: User): Actor {
  return { id: u.id, role: u.role, organisationId: u.organisationId, homeSiteId: u.homeSiteId };
}

/** Generates the pool, its history and the open orders of the coming weeks. */
export async function generateHistory(opts: { bins: number; months: number; now?: Date; seed?: number }) {
  const now = opts.now ?? new Date();
  const rnd = seededRandom(opts.seed ?? 20261201);
  const start = new Date(now.getTime() - opts.months * 30.44 * DAY);
  const world = await loadWorld(now, start, rnd);
  await createLinerLots(world);

  // Register the pool: most bins were there before the window, a tenth joined during it.
  const plans: Array<{ asset: Asset; joined: Date; depot: Site }> = [];
  let serial = 0;
  for (let i = 0; i < opts.bins; i++) {
    const type = rnd.chance(0.7) ? world.types[0]! : world.types[1]!;
    const depot = rnd.pick(world.depots);
    const joined = rnd.chance(0.9) ? start : new Date(start.getTime() + rnd.int(30, Math.max(31, (now.getTime() - start.getTime()) / DAY - 60)) * DAY);
    const made = manufactureMonthFor(rnd, joined);
    const lastTest = testHistoryFor(rnd, made, joined, type);
    serial += 1;
    const grai = makeGrai(OPERATOR.gs1CompanyPrefix, type.graiAssetType, String(100000 + serial));
    const asset = await registerBin(
      world.planner,
      {
        grai, binTypeId: type.id, siteId: depot.id, manufactureMonth: made,
        unMarking: type.unCode ? `${type.unCode}/Y/${made.slice(5, 7)} ${made.slice(2, 4)}/NL/NMP 4417/2313/${Number(type.maxGrossKg)}` : null,
        lastIntermediateTestMonth: lastTest,
      },
      { now: joined },
    );
    plans.push({ asset, joined, depot });
  }

  // Each bin lives its own cycles; a few at a time so the two cores stay busy.
  const queue = [...plans];
  const workers = Array.from({ length: 4 }, async () => {
    for (let p = queue.shift(); p; p = queue.shift()) await liveBin(world, p.asset, p.depot, p.joined);
  });
  await Promise.all(workers);

  await closePastOrders(world);
  await openComingOrders(world);
  return world.stats;
}

async function loadWorld(now: Date, start: Date, rnd: Random): Promise<World> {
  const depots = await Site.findAll({ where: { kind: 'depot' }, order: [['id', 'ASC']] });
  const users = await User.findAll();
  const planner = users.find((u) => u.role === 'planner')!;
  const yardByDepot = new Map<number, Actor>();
  for (const d of depots) {
    const yard = users.find((u) => u.role === 'yard' && u.homeSiteId === d.id);
    yardByDepot.set(d.id, yard ? actorOf(yard) : actorOf(planner));
  }
  const customerActor = new Map<number, Actor>();
  for (const u of users.filter((u) => u.role === 'customer')) customerActor.set(u.organisationId, actorOf(u));
  const orgs = await Organisation.findAll({ where: { kind: 'customer' } });
  const sites = await Site.findAll({ where: { kind: 'customer' } });
  const customers = CUSTOMERS.map((c, i) => {
    const org = orgs.find((o) => o.name === c.name)!;
    const filling = sites.find((s) => s.code === c.sites.find((x) => x.role === 'filling')!.code)!;
    const receivingDef = c.sites.find((x) => x.role === 'receiving') ?? c.sites[0]!;
    const receiving = sites.find((s) => s.code === receivingDef.code)!;
    return { org, filling, receiving, homeDepot: depots.find((d) => d.code === c.homeDepot)!, slowPayer: i === 3 || i === 5 };
  });
  const types = await BinType.findAll({ order: [['id', 'ASC']] });
  return { now, start, rnd, planner: actorOf(planner), yardByDepot, customerActor, depots, customers, types, lots: [], orders: new Map(), stats: {} };
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

async function createLinerLots(world: World) {
  const { rnd } = world;
  let n = 0;
  for (const depot of world.depots) {
    // A lot every ~2 months, 24 months' shelf life from receipt.
    for (let t = world.start.getTime() - 120 * DAY; t < world.now.getTime(); t += rnd.int(50, 70) * DAY) {
      n += 1;
      const supplier = LINER_SUPPLIERS[n % LINER_SUPPLIERS.length]!;
      const received = localDate(new Date(t), OPERATOR.timeZone);
      const expiry = localDate(new Date(t + rnd.int(600, 760) * DAY), OPERATOR.timeZone);
      world.lots.push(
        await LinerLot.create({
          supplier: supplier.name, lotNumber: `${supplier.prefix}${received.slice(2, 4)}${received.slice(5, 7)}-${String(n).padStart(3, '0')}`,
          spec: supplier.spec, quantityReceived: rnd.pick([300, 400, 500]), receivedOn: received, expiryDate: expiry,
          siteId: depot.id, certificateId: null, statusReason: null,
        }),
      );
    }
  }
}

/** First-expiry-first-out among lots received at the depot by that date and usable then. */
function lotFor(world: World, depotId: number, at: Date): LinerLot | null {
  const day = localDate(at, OPERATOR.timeZone);
  const usable = world.lots.filter((l) => l.siteId === depotId && l.receivedOn <= day && l.expiryDate >= day && l.status === 'released');
  usable.sort((a, b) => a.expiryDate.localeCompare(b.expiryDate));
  return usable[0] ?? null;
}

async function orderFor(world: World, customer: World['customers'][number], depot: Site, type: BinType, at: Date): Promise<HireOrder> {
  const week = Math.floor(at.getTime() / (7 * DAY));
  const key = `${customer.org.id}:${depot.id}:${type.id}:${week}`;
  let p = world.orders.get(key);
  if (!p) {
    const n = world.orders.size + 1;
    p = HireOrder.create({
      reference: `HO-${localDate(at, OPERATOR.timeZone).slice(2, 7).replace('-', '')}-${String(n).padStart(4, '0')}`,
      customerId: customer.org.id, deliverySiteId: customer.filling.id, depotSiteId: depot.id, binTypeId: type.id,
      quantity: 1, neededBy: localDate(new Date(at.getTime() + 2 * DAY), OPERATOR.timeZone), status: 'loading',
      product: PRODUCTS[customer.org.name] ?? null, notes: null,
    });
    world.orders.set(key, p);
    return p;
  }
  const order = await p;
  // The history's orders grow by one bin per dispatch, so each new bin reopens its order for loading
  // (the scan service marks an order dispatched once every ordered bin has left).
  await HireOrder.update({ quantity: sequelize.literal('quantity + 1'), status: 'loading' }, { where: { id: order.id } });
  return order;
}

/** One bin's life from `joined` until now. */
async function liveBin(world: World, bin: Asset, homeDepot: Site, joined: Date) {
  const { rnd, now } = world;
  const assetId = bin.id;
  const binType = world.types.find((ty) => ty.id === bin.binTypeId)!;
  const due = { next: bin.nextDue };
  let t = joined.getTime() + rnd.int(1, 8) * HOUR;
  let depot = homeDepot;

  const scan = async (actor: Actor, input: Omit<ScanInput, 'clientEventId' | 'assetId' | 'occurredAt'>, at: number): Promise<boolean> => {
    if (at > now.getTime()) return false;
    try {
      await recordScan(actor, { clientEventId: randomUUID(), assetId, occurredAt: new Date(at), ...input }, { now: new Date(at + 60_000) });
      count(world, input.action);
      return true;
    } catch (e) {
      if (e instanceof AppError && e.code === 'transition_refused') {
        count(world, `refused:${(e.details as { reason?: string })?.reason ?? e.code}`);
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
    await keepTestInDate(world, assetId, t, yard, due);
    const pass = !rnd.chance(0.04);
    if (!(await scan(yard, { action: 'prep_check', siteId: depot.id, prepResult: pass ? 'pass' : 'fail', checklist: prepChecklist(pass), faults: pass ? undefined : rnd.pick(FAULTS) }, t))) return;
    if (!pass) {
      count(world, 'quarantined');
      if (rnd.chance(0.05)) {
        later(3, 10);
        await scan(world.planner, { action: 'retire', siteId: depot.id, note: 'Beyond economic repair.' }, t);
        return;
      }
      later(1, 5);
      if (!(await scan(yard, { action: 'send_to_repair', siteId: depot.id }, t))) return;
      later(4, 14);
      if (!(await scan(world.planner, { action: 'release', siteId: null, note: 'Repaired and retested.' }, t))) return;
      continue;
    }
    later(0, 1);
    const lot = lotFor(world, depot.id, new Date(t));
    if (!lot || !(await scan(yard, { action: 'fit_liner', siteId: depot.id, linerLotId: lot.id }, t))) return;

    const customer = rnd.chance(0.75) ? rnd.pick(world.customers.filter((c) => c.homeDepot.id === depot.id).concat(world.customers)) : rnd.pick(world.customers);
    later(0, 4);
    const order = await orderFor(world, customer, depot, binType, new Date(t));
    if (!(await scan(yard, { action: 'dispatch', siteId: depot.id, purpose: 'hire', hireOrderId: order.id }, t))) return;

    const driver = world.yardByDepot.get(customer.homeDepot.id)!;
    const customerActor = world.customerActor.get(customer.org.id) ?? world.planner;
    later(0, 2);
    const skipDeliver = rnd.chance(0.03);
    if (!skipDeliver && !(await scan(driver, { action: 'deliver', siteId: customer.filling.id }, t))) return;
    later(1, 6);
    const product = PRODUCTS[customer.org.name] ?? 'Vegetable oil';
    const volume = rnd.int(880, 960);
    const fill = { product, volumeL: volume, massKg: Math.round(volume * 0.92), temperatureC: rnd.int(8, 24), seals: [sealNumber(rnd), sealNumber(rnd)] };
    if (!(await scan(customerActor, { action: 'fill_seal', siteId: customer.filling.id, fill }, t))) return;

    // With the customer: discharged at the receiving site, folded, waiting for the haulier.
    const slow = customer.slowPayer && rnd.chance(0.35);
    later(4, slow ? 45 : 24);
    if (rnd.chance(0.003)) {
      later(60, 120);
      await scan(world.planner, { action: 'mark_missing', siteId: null, note: 'Not seen for months; customer cannot find it.' }, t);
      count(world, 'went_missing');
      return;
    }
    const seals = rnd.chance(0.01) ? [fill.seals[0]!, sealNumber(rnd)] : fill.seals;
    if (!(await scan(customerActor, { action: 'discharge', siteId: customer.receiving.id, sealsVerified: seals }, t))) return;
    later(0, 2);
    if (!(await scan(customerActor, { action: 'fold', siteId: customer.receiving.id }, t))) return;
    later(3, slow ? 30 : 14);
    const skipCollect = rnd.chance(0.1); // the haulier forgot to scan; the depot infers it
    if (!skipCollect && !(await scan(driver, { action: 'collect', siteId: customer.receiving.id }, t))) return;
    later(1, 3);
    depot = rnd.chance(0.85) ? customer.homeDepot : rnd.pick(world.depots);
    if (!(await scan(world.yardByDepot.get(depot.id)!, { action: 'receive', siteId: depot.id }, t))) return;
  }
}

/** Books and passes the periodic test when it falls due within the next three weeks (the yard would). */
async function keepTestInDate(world: World, assetId: number, at: number, inspector: Actor, known: { next: string | null }) {
  const today = localDate(new Date(at), OPERATOR.timeZone);
  const soon = localDate(new Date(at + 21 * DAY), OPERATOR.timeZone);
  if (!known.next || known.next > soon) return;
  // Most are tested in time; a few slip past their date and wait for the booking.
  if (known.next < today && world.rnd.chance(0.15)) return;
  const asset = await Asset.findByPk(assetId, { include: [{ model: BinType, as: 'binType' }] });
  if (!asset?.nextDue) return;
  const type = (asset as Asset & { binType: BinType }).binType;
  const month = today.slice(0, 7);
  const full = asset.nextFullDue !== null && asset.nextFullDue <= soon;
  const due = nextDue(
    {
      manufactureMonth: asset.manufactureMonth.slice(0, 7),
      lastIntermediateTestMonth: month,
      lastFullInspectionMonth: full ? month : (asset.lastFullInspectionOn?.slice(0, 7) ?? null),
    },
    policyForBinType(type),
  );
  await sequelize.transaction(async (transaction) => {
    await Inspection.create(
      {
        assetId, kind: full ? 'full' : 'intermediate', performedOn: today, inspectorId: inspector.id, siteId: asset.siteId,
        checklist: { external: true, serviceEquipment: true, marks: true, internal: full }, leakTestPressureKpa: '20', leakTestMinutes: '10',
        leakTestPassed: true, outcome: 'pass', nextIntermediateDue: due.intermediateDue, nextFullDue: due.fullDue, notes: null, scanEventId: null,
      },
      { transaction },
    );
    asset.lastInspectionOn = today;
    if (full) asset.lastFullInspectionOn = today;
    asset.nextIntermediateDue = due.intermediateDue;
    asset.nextFullDue = due.fullDue;
    asset.nextDue = due.nextDue;
    await asset.save({ transaction });
  });
  known.next = due.nextDue;
  count(world, full ? 'full_tests' : 'intermediate_tests');
}

const FAULTS = ['Cracked floor panel', 'Bent side-wall lock', 'Discharge port seat damaged', 'Sharp edge on inner wall', 'Label unreadable'];

function prepChecklist(pass: boolean): Record<string, boolean> {
  return { panelsAndLocks: pass, floorAndWalls: pass, dischargePort: true, lidAndSealHoles: true, labelLegible: true };
}

function sealNumber(rnd: Random): string {
  return `TE${rnd.int(1000000, 9999999)}`;
}

async function closePastOrders(world: World) {
  const today = localDate(world.now, OPERATOR.timeZone);
  await HireOrder.update({ status: 'closed' }, { where: { neededBy: { [Op.lt]: today } } });
  await HireOrder.update({ status: 'dispatched' }, { where: { status: 'loading' } });
}

/** Orders for the coming three weeks, so depots have bins to prepare. */
async function openComingOrders(world: World) {
  const { rnd } = world;
  let n = 0;
  for (const c of world.customers) {
    for (let k = 0; k < 2; k++) {
      n += 1;
      const needed = new Date(world.now.getTime() + rnd.int(2, 21) * DAY);
      await HireOrder.create({
        reference: `HO-${localDate(needed, OPERATOR.timeZone).slice(2, 7).replace('-', '')}-N${String(n).padStart(3, '0')}`,
        customerId: c.org.id, deliverySiteId: c.filling.id, depotSiteId: c.homeDepot.id, binTypeId: world.types[k % 2]!.id,
        quantity: rnd.pick([12, 20, 24, 24, 30, 40]), neededBy: localDate(needed, OPERATOR.timeZone), status: 'confirmed',
        product: PRODUCTS[c.org.name] ?? null, notes: null,
      });
    }
  }
  count(world, 'open_orders', n);
}

