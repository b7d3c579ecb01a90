import bcrypt from 'bcryptjs';
import { sequelize, Organisation, Site, User, Setting, BinType, Tariff, Trailer } from '@/models';
import { QueryTypes, type Transaction } from 'sequelize';
import { generateHistory } from './history';
import { issueStatement } from '@/lib/billing/statements.server';
import { issueInvoice, recordPayment } from '@/lib/billing/invoices.server';
import { lastClosedMonth } from '@/lib/billing/statement-input';
import { localDate, type LocalDate } from '@/lib/calendar';
import { finishSeedRun, stallPoint, startSeedRun } from './seed-run';
import { DEMO_LOGINS, DEMO_PASSWORD, SECOND_CUSTOMER_LOGIN } from './demo-logins.mjs';
import { OPERATOR, DEPOTS, REPAIR_SHOP, CUSTOMERS, CUSTOMER_BILLING, EXTRA_STAFF, BIN_TYPES, TRAILERS } from './scenario';

/**
 * Seeds the invented demo scenario into an empty database: who is who, then the
 * pool's history, in two transactions. A seed_runs row is started first and
 * finished in the second transaction, so a seed killed in between is detected.
 */
export async function seedDemo(opts: { bins?: number; months?: number; now?: Date } = {}) {
  const run = await startSeedRun();
  const people = await seedPeopleAndPlaces();
  await stallPoint('history');
  return sequelize.transaction(async (transaction) => {
    for (const t of BIN_TYPES) await BinType.create(t, { transaction });
    const history = await generateHistory({ bins: opts.bins ?? Number(process.env.DEMO_BINS ?? 600), months: opts.months ?? 18, now: opts.now, transaction });
    const statements = await issueDemoStatements(opts.now ?? new Date(), transaction);
    const summary = { ...people, ...history, statements };
    await stallPoint('finish');
    await finishSeedRun(run, summary, transaction);
    return summary;
  });
}

/**
 * The month before last, issued and invoiced for every customer (so the portal has a statement and an invoice to
 * check, some paid, and the next month's corrections have something to correct); the last month is left as
 * drafts for the admin to issue.
 */
async function issueDemoStatements(now: Date, transaction: Transaction): Promise<number> {
  const month = lastClosedMonth(`${lastClosedMonth(localDate(now, OPERATOR.timeZone))}-01` as LocalDate);
  const customers = await Organisation.findAll({ where: { kind: 'customer' }, order: [['id', 'ASC']], transaction });
  const seed = { userId: null, ip: null };
  for (const [i, c] of customers.entries()) {
    const { id } = await issueStatement(c.id, month, seed, { transaction, now });
    // Invoiced on issue (when it comes to something: a small demo pool may leave a customer nothing that month);
    // the second and third customers have paid by bank transfer, the fourth half of it; the first (the demo
    // customer login's) has its invoice to pay online.
    const [row] = await sequelize.query<{ gross_minor: string }>(`SELECT gross_minor FROM statements WHERE id = $1`, { bind: [id], type: QueryTypes.SELECT, transaction });
    const gross = Number(row!.gross_minor);
    if (gross <= 0) continue;
    const invoice = await issueInvoice(id, seed, { transaction, now, mail: false });
    const paid = i === 1 || i === 2 ? gross : i === 3 ? Math.floor(gross / 2) : 0;
    if (paid > 0)
      await recordPayment(invoice.id, { amountMinor: paid, method: 'bank_transfer', paidOn: localDate(now, OPERATOR.timeZone), note: 'Demo transfer' }, seed, {
        transaction,
        mail: false,
      });
  }
  return customers.length;
}

async function seedPeopleAndPlaces() {
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  return sequelize.transaction(async (transaction) => {
    const opts = { transaction };
    await Setting.create(
      {
        operatorName: OPERATOR.name,
        gs1CompanyPrefix: OPERATOR.gs1CompanyPrefix,
        gs1PrefixLength: OPERATOR.gs1PrefixLength,
        digitalLinkBase: process.env.APP_URL ?? 'http://localhost:4321',
        timeZone: OPERATOR.timeZone,
        currency: OPERATOR.currency,
        taxRate: OPERATOR.taxRate,
        mailSender: OPERATOR.mailSender,
        returnInstructions: OPERATOR.returnInstructions,
      },
      opts,
    );
    const operator = await Organisation.create({ name: OPERATOR.name, kind: 'operator', contactEmail: OPERATOR.contactEmail }, opts);

    const sitesByCode = new Map<string, Site>();
    for (const d of [...DEPOTS.map((d) => ({ ...d, kind: 'depot' as const })), { ...REPAIR_SHOP, kind: 'repair' as const }]) {
      const site = await Site.create(
        { organisationId: operator.id, code: d.code, name: d.name, kind: d.kind, address: d.address, latitude: String(d.lat), longitude: String(d.lon) },
        opts,
      );
      sitesByCode.set(d.code, site);
    }

    const customers = new Map<string, Organisation>();
    for (const c of CUSTOMERS) {
      const org = await Organisation.create(
        {
          name: c.name,
          kind: 'customer',
          contactEmail: c.email,
          freeDays: c.freeDays,
          dailyRate: c.dailyRate,
          tripFee: c.tripFee,
          lostBinFee: c.lostBinFee,
          currency: OPERATOR.currency,
          country: CUSTOMER_BILLING[c.name]?.country ?? null,
          vatId: CUSTOMER_BILLING[c.name]?.vatId ?? null,
        },
        opts,
      );
      customers.set(c.name, org);
      // The customer's tariff: orders and billing read their terms from here, in force since before the history.
      await Tariff.create(
        {
          customerId: org.id,
          freeDays: c.freeDays,
          dailyRate: c.dailyRate,
          perTripFee: c.tripFee,
          lostBinFee: c.lostBinFee,
          currency: OPERATOR.currency,
          validFrom: '2020-01-01',
          validTo: null,
          linerFee: CUSTOMER_BILLING[c.name]?.linerFee ?? '0',
          stopFee: CUSTOMER_BILLING[c.name]?.stopFee ?? '0',
        },
        opts,
      );
      for (const s of c.sites) {
        const site = await Site.create(
          { organisationId: org.id, code: s.code, name: s.name, kind: 'customer', address: s.address, latitude: String(s.lat), longitude: String(s.lon) },
          opts,
        );
        sitesByCode.set(s.code, site);
      }
    }

    for (const t of TRAILERS) await Trailer.create({ ...t }, opts);

    const firstCustomer = customers.get(CUSTOMERS[0]!.name)!;
    for (const l of DEMO_LOGINS) {
      await User.create(
        {
          email: l.email,
          name: l.name,
          passwordHash,
          role: l.role as 'admin',
          organisationId: l.role === 'customer' ? firstCustomer.id : operator.id,
          homeSiteId: l.role === 'yard' ? sitesByCode.get('DEP-RTM')!.id : null,
          qualifiedInspector: l.role === 'yard',
          portalAdmin: l.role === 'customer', // the demo buyer invites and limits colleagues
          lastSignInAt: null,
        },
        opts,
      );
    }
    const second = SECOND_CUSTOMER_LOGIN;
    await User.create(
      {
        email: second.email,
        name: second.name,
        passwordHash,
        role: 'customer',
        organisationId: customers.get(second.organisation)!.id,
        homeSiteId: null,
        qualifiedInspector: false,
        lastSignInAt: null,
      },
      opts,
    );
    for (const s of EXTRA_STAFF) {
      await User.create(
        {
          email: s.email,
          name: s.name,
          passwordHash,
          role: s.role,
          organisationId: operator.id,
          homeSiteId: sitesByCode.get(s.homeDepot)!.id,
          qualifiedInspector: s.qualifiedInspector,
          lastSignInAt: null,
        },
        opts,
      );
    }
    return { customers: customers.size, sites: sitesByCode.size, users: DEMO_LOGINS.length + 1 + EXTRA_STAFF.length };
  });
}
