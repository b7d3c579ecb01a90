// The pool set-up services against the real test database: what they refuse
// (with the field named), a stale copy refused without a change, and the audit
// entry each change leaves (only what changed, who, from where).
import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { AuditEntry, Organisation, Site, Tariff } from '@/models';
import { createCustomer, updateCustomer, listCustomers } from '@/lib/pool-setup/customers.server';
import { createSite, updateSite, listSites } from '@/lib/pool-setup/sites.server';
import { createBinType, updateBinType, binTypeById } from '@/lib/pool-setup/bin-types.server';
import { binTypeCreateSchema, customerCreateSchema, siteCreateSchema } from '@/lib/pool-setup/setup-schemas';
import { newBin } from '../support/fixtures';

const w = usePoolWorld();
const actor = () => ({ userId: w.planner.id, ip: '198.51.100.7' });

async function lastAudit(entityType: string, id: number) {
  return AuditEntry.findOne({ where: { entityType, entityId: String(id) }, order: [['id', 'DESC']] });
}

describe('customers', () => {
  test('a new customer starts with its first tariff from today; both audited', async () => {
    const input = customerCreateSchema.parse({
      name: '  Harbour Coatings ',
      contactEmail: 'Desk@Harbour.example',
      terms: { freeDays: 21, dailyRate: '1.40', perTripFee: '12.00', lostBinFee: '450.00', currency: 'EUR' },
    });
    const row = await createCustomer(input, actor());
    expect(row).toMatchObject({ name: 'Harbour Coatings', contactEmail: 'desk@harbour.example', active: true, version: 0, sites: 0 });
    expect(row.terms).toMatchObject({ freeDays: 21, dailyRate: '1.40', perTripFee: '12.00', currency: 'EUR', validTo: null });
    expect(await Tariff.count({ where: { customerId: row.id } })).toBe(1);
    expect(await lastAudit('customer', row.id)).toMatchObject({ action: 'customer.create', userId: w.planner.id, ip: '198.51.100.7', after: { name: 'Harbour Coatings' } });
    expect((await listCustomers()).map((c) => c.name)).toContain('Harbour Coatings');
  });

  test('a stale copy is refused (changed_meanwhile) and changes nothing; a rename keeps only what changed', async () => {
    const c = await createCustomer(
      customerCreateSchema.parse({ name: 'Delta Resins', terms: { freeDays: 14, dailyRate: '1.00', perTripFee: '0', lostBinFee: '300', currency: 'EUR' } }),
      actor(),
    );
    const renamed = await updateCustomer(c.id, { version: 0, name: 'Delta Resins BV' }, actor());
    expect(renamed.version).toBe(1);
    expect(await lastAudit('customer', c.id)).toMatchObject({ action: 'customer.update', before: { name: 'Delta Resins' }, after: { name: 'Delta Resins BV' } });
    await expect(updateCustomer(c.id, { version: 0, name: 'Someone else’s idea' }, actor())).rejects.toMatchObject({ code: 'changed_meanwhile' });
    expect((await Organisation.findByPk(c.id))!.name).toBe('Delta Resins BV');
    const closed = await updateCustomer(c.id, { version: 1, active: false }, actor());
    expect(closed).toMatchObject({ active: false, version: 2 });
    expect(await lastAudit('customer', c.id)).toMatchObject({ action: 'customer.deactivate' });
  });

  test('saving the same values writes no entry and keeps the version', async () => {
    const c = (await listCustomers()).find((x) => x.name === 'Harbour Coatings')!;
    const before = await AuditEntry.count();
    const same = await updateCustomer(c.id, { version: c.version, name: c.name }, actor());
    expect(same.version).toBe(c.version);
    expect(await AuditEntry.count()).toBe(before);
  });

  test('the operator is not a customer to edit', async () => {
    await expect(updateCustomer(w.operator.id, { version: w.operator.version, name: 'x' }, actor())).rejects.toMatchObject({ code: 'not_found' });
  });

  test('bad input is refused with the field named', () => {
    const bad = customerCreateSchema.safeParse({
      name: '',
      contactEmail: 'not-mail',
      terms: { freeDays: -1, dailyRate: '1,50', perTripFee: '0', lostBinFee: '0', currency: 'eur' },
    });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['name', 'contactEmail', 'terms.freeDays', 'terms.dailyRate', 'terms.currency']));
  });
});

describe('sites', () => {
  test('a repair shop belongs to the operator, with coordinates; audited', async () => {
    const input = siteCreateSchema.parse({ organisationId: w.operator.id, code: 'rep-east', name: 'East repair shop', kind: 'repair', latitude: 52.37, longitude: 6.66 });
    const s = await createSite(input, actor());
    expect(s).toMatchObject({ code: 'REP-EAST', kind: 'repair', latitude: 52.37, longitude: 6.66, organisationName: 'Test Pool', bins: 0 });
    expect(await lastAudit('site', s.id)).toMatchObject({ action: 'site.create', after: { code: 'REP-EAST', kind: 'repair' } });
  });

  test('a depot cannot belong to a customer, nor a customer site to the operator', async () => {
    await expect(
      createSite(siteCreateSchema.parse({ organisationId: w.customer.id, code: 'DEP-X', name: 'X', kind: 'depot', latitude: null, longitude: null }), actor()),
    ).rejects.toMatchObject({ code: 'validation_failed', details: [expect.objectContaining({ path: 'kind' })] });
    await expect(
      createSite(siteCreateSchema.parse({ organisationId: w.operator.id, code: 'CUS-X', name: 'X', kind: 'customer', latitude: null, longitude: null }), actor()),
    ).rejects.toMatchObject({ code: 'validation_failed', details: [expect.objectContaining({ path: 'organisationId' })] });
    expect(await Site.count({ where: { code: ['DEP-X', 'CUS-X'] } })).toBe(0);
  });

  test('a code in use, half a position, or a latitude off the globe is refused', async () => {
    await expect(
      createSite(siteCreateSchema.parse({ organisationId: w.operator.id, code: 'DEP-T1', name: 'Again', kind: 'depot', latitude: null, longitude: null }), actor()),
    ).rejects.toMatchObject({ details: [expect.objectContaining({ path: 'code' })] });
    const half = siteCreateSchema.safeParse({ organisationId: w.operator.id, code: 'DEP-H', name: 'Half', kind: 'depot', latitude: 51, longitude: null });
    expect(half.error?.issues.map((i) => i.path.join('.'))).toEqual(['longitude']);
    const off = siteCreateSchema.safeParse({ organisationId: w.operator.id, code: 'DEP-O', name: 'Off', kind: 'depot', latitude: 91, longitude: 4 });
    expect(off.error?.issues.map((i) => i.path.join('.'))).toEqual(['latitude']);
  });

  test('moving a depot: a stale copy is refused; the audit keeps the old and new position', async () => {
    const [depot] = (await listSites()).filter((s) => s.code === 'DEP-T2');
    const moved = await updateSite(depot!.id, { version: depot!.version, latitude: 51.45, longitude: 6.75 }, actor());
    expect(moved).toMatchObject({ latitude: 51.45, longitude: 6.75, version: depot!.version + 1 });
    expect(await lastAudit('site', depot!.id)).toMatchObject({ action: 'site.update', before: { latitude: 51.4, longitude: 6.7 }, after: { latitude: 51.45, longitude: 6.75 } });
    await expect(updateSite(depot!.id, { version: depot!.version, name: 'Stale' }, actor())).rejects.toMatchObject({ code: 'changed_meanwhile' });
    expect((await Site.findByPk(depot!.id))!.name).toBe('Second depot');
    await expect(updateSite(depot!.id, { version: moved.version, latitude: null }, actor())).rejects.toMatchObject({
      code: 'validation_failed',
      details: [expect.objectContaining({ path: 'latitude' })],
    });
    expect(Number((await Site.findByPk(depot!.id))!.latitude)).toBe(51.45);
  });

  test('a site where bins stand cannot be closed', async () => {
    await newBin(w);
    const depot = (await listSites()).find((s) => s.code === 'DEP-T1')!;
    expect(depot.bins).toBeGreaterThan(0);
    await expect(updateSite(depot.id, { version: depot.version, active: false }, actor())).rejects.toMatchObject({ code: 'unprocessable' });
    expect((await Site.findByPk(depot.id))!.active).toBe(true);
  });
});

describe('bin types', () => {
  const folding = {
    code: 'fx1250',
    name: 'Folding IBC 1250 L',
    graiAssetType: '10020',
    nominalCapacityL: 1250,
    tareKg: 98.5,
    maxGrossKg: 1600,
    footprintLengthMm: 1200,
    footprintWidthMm: 1000,
    heightErectedMm: 1340,
    heightFoldedMm: 420,
    unCode: '31ha1',
    policyKind: 'un',
    intermediateMonths: 30,
    fullMonths: 60,
  };

  test('a new type, its code and UN code in capitals; audited', async () => {
    const b = await createBinType(binTypeCreateSchema.parse(folding), actor());
    expect(b).toMatchObject({ code: 'FX1250', unCode: '31HA1', tareKg: 98.5, maxGrossKg: 1600, bins: 0, active: true });
    expect(await lastAudit('bin_type', b.id)).toMatchObject({ action: 'bin_type.create', after: { code: 'FX1250', heightFoldedMm: 420 } });
  });

  test('an edit merged onto the row must still hold together: folded above erected is refused', async () => {
    const b = await binTypeById((await createBinType(binTypeCreateSchema.parse({ ...folding, code: 'FX-B', graiAssetType: '10021' }), actor())).id);
    await expect(updateBinType(b.id, { version: b.version, heightFoldedMm: 1400 }, actor())).rejects.toMatchObject({
      code: 'validation_failed',
      details: [expect.objectContaining({ path: 'heightFoldedMm' })],
    });
    await expect(updateBinType(b.id, { version: b.version, intermediateMonths: 36 }, actor())).rejects.toMatchObject({
      details: [expect.objectContaining({ path: 'intermediateMonths' })],
    });
    const ok = await updateBinType(b.id, { version: b.version, maxGrossKg: 1650.5 }, actor());
    expect(ok).toMatchObject({ maxGrossKg: 1650.5, version: b.version + 1 });
    expect(await lastAudit('bin_type', b.id)).toMatchObject({ before: { maxGrossKg: 1600 }, after: { maxGrossKg: 1650.5 } });
    await expect(updateBinType(b.id, { version: b.version, name: 'Stale' }, actor())).rejects.toMatchObject({ code: 'changed_meanwhile' });
  });

  test('asset type and policy are fixed once bins of the type exist; the name is not', async () => {
    const used = await binTypeById(w.binType.id);
    expect(used.bins).toBeGreaterThan(0);
    await expect(updateBinType(used.id, { version: used.version, graiAssetType: '777' }, actor())).rejects.toMatchObject({
      details: [expect.objectContaining({ path: 'graiAssetType' })],
    });
    await expect(updateBinType(used.id, { version: used.version, name: 'Test bin, renamed' }, actor())).resolves.toMatchObject({ name: 'Test bin, renamed' });
  });

  test('an unknown UN code is refused with its field', () => {
    const r = binTypeCreateSchema.safeParse({ ...folding, unCode: '99ZZ' });
    expect(r.error?.issues.map((i) => i.path.join('.'))).toContain('unCode');
  });
});
