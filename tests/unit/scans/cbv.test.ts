import { describe, expect, test } from 'vitest';
import { ACTIONS, type Action } from '@/lib/scans/lifecycle';
import { CBV_MAPPING } from '@/lib/scans/cbv';

describe('GS1 CBV 2.0 mapping for the EPCIS export', () => {
  // The bizSteps and dispositions that fit a returnable bin (REFERENCES §5, from GS1 CBV 2.0 [published]).
  const FITTING_BIZSTEPS = [
    'commissioning',
    'inspecting',
    'loading',
    'shipping',
    'departing',
    'arriving',
    'receiving',
    'collecting',
    'repairing',
    'storing',
    'decommissioning',
    'other',
  ];
  const FITTING_DISPOSITIONS = [
    'active',
    'available',
    'in_transit',
    'container_closed',
    'container_open',
    'returned',
    'damaged',
    'needs_replacement',
    'non_conformant',
    'conformant',
    'unavailable',
    'inactive',
    'destroyed',
    'stolen',
  ];
  // The full CBV vocabularies as enumerated in GS1's EPCIS 2.0 JSON schema (gs1/EPCIS repository,
  // EPCIS-JSON-Schema.json, definitions/bizStep and definitions/disposition), copied by hand.
  // prettier-ignore
  const SCHEMA_BIZSTEPS = [
    'accepting',
    'arriving',
    'assembling',
    'collecting',
    'commissioning',
    'consigning',
    'creating_class_instance',
    'cycle_counting',
    'decommissioning',
    'departing',
    'destroying',
    'disassembling',
    'dispensing',
    'encoding',
    'entering_exiting',
    'holding',
    'inspecting',
    'installing',
    'killing',
    'loading',
    'other',
    'packing',
    'picking',
    'receiving',
    'removing',
    'repackaging',
    'repairing',
    'replacing',
    'reserving',
    'retail_selling',
    'shipping',
    'staging_outbound',
    'stock_taking',
    'stocking',
    'storing',
    'transporting',
    'unloading',
    'unpacking',
    'void_shipping',
    'sensor_reporting',
    'sampling',
  ];
  // prettier-ignore
  const SCHEMA_DISPOSITIONS = [
    'active',
    'container_closed',
    'damaged',
    'destroyed',
    'dispensed',
    'disposed',
    'encoded',
    'expired',
    'in_progress',
    'in_transit',
    'inactive',
    'no_pedigree_match',
    'non_sellable_other',
    'partially_dispensed',
    'recalled',
    'reserved',
    'retail_sold',
    'returned',
    'sellable_accessible',
    'sellable_not_accessible',
    'stolen',
    'unknown',
    'available',
    'completeness_verified',
    'completeness_inferred',
    'conformant',
    'container_open',
    'mismatch_instance',
    'mismatch_class',
    'mismatch_quantity',
    'needs_replacement',
    'non_conformant',
    'unavailable',
  ];

  test('the fitting lists are part of the published vocabularies', () => {
    for (const b of FITTING_BIZSTEPS) expect(SCHEMA_BIZSTEPS).toContain(b);
    for (const d of FITTING_DISPOSITIONS) expect(SCHEMA_DISPOSITIONS).toContain(d);
  });

  test('every action has one row, with a bizStep and disposition from the lists', () => {
    expect(Object.keys(CBV_MAPPING).sort()).toEqual([...ACTIONS].sort());
    for (const action of ACTIONS) {
      const row = CBV_MAPPING[action];
      expect(FITTING_BIZSTEPS, action).toContain(row.bizStep);
      expect(FITTING_DISPOSITIONS, action).toContain(row.disposition);
      if (row.dispositionOnFail !== undefined) expect(FITTING_DISPOSITIONS).toContain(row.dispositionOnFail);
    }
  });

  // CBV 2.0 definitions (from memory): commissioning = first identifying an object, decommissioning
  // its end; shipping = sending outbound; collecting = picking up returnable assets; a prep-check
  // failure is non_conformant.
  // prettier-ignore
  const SPOT: [Action, string, string][] = [
    ['register', 'commissioning', 'active'],
    ['retire', 'decommissioning', 'inactive'],
    ['dispatch', 'shipping', 'in_transit'],
    ['collect', 'collecting', 'in_transit'],
    ['receive', 'receiving', 'available'],
    ['send_to_repair', 'repairing', 'damaged'],
  ];
  test.each(SPOT)('%s → %s / %s', (action, bizStep, disposition) => {
    expect(CBV_MAPPING[action]).toMatchObject({ bizStep, disposition });
  });
  test('a failed prep check exports as non_conformant', () => {
    expect(CBV_MAPPING.prep_check.dispositionOnFail).toBe('non_conformant');
  });
});
