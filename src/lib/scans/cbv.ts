import type { Action } from './lifecycle';

// GS1 CBV 2.0 vocabulary for the EPCIS export: one explicit row per action. Only the bizSteps and
// dispositions that fit a returnable, lined bin are used; CBV has no "filling", "lining" or "folding"
// step, so those export as `other` with the disposition saying what changed.

export type CbvBizStep =
  | 'commissioning'
  | 'inspecting'
  | 'loading'
  | 'shipping'
  | 'departing'
  | 'arriving'
  | 'receiving'
  | 'collecting'
  | 'repairing'
  | 'storing'
  | 'decommissioning'
  | 'other';
export type CbvDisposition =
  | 'active'
  | 'available'
  | 'in_transit'
  | 'container_closed'
  | 'container_open'
  | 'returned'
  | 'damaged'
  | 'needs_replacement'
  | 'non_conformant'
  | 'conformant'
  | 'unavailable'
  | 'inactive'
  | 'destroyed'
  | 'stolen';

export interface CbvRow {
  bizStep: CbvBizStep;
  disposition: CbvDisposition;
  dispositionOnFail?: CbvDisposition; // prep_check and inspect: a failed check sends the bin to quarantine
}

export const CBV_MAPPING: Record<Action, CbvRow> = {
  register: { bizStep: 'commissioning', disposition: 'active' }, // enters the pool
  receive: { bizStep: 'receiving', disposition: 'available' }, // back at a depot, empty, usable again
  prep_check: { bizStep: 'inspecting', disposition: 'conformant', dispositionOnFail: 'non_conformant' },
  fit_liner: { bizStep: 'other', disposition: 'available' }, // lined and closed, ready for hire
  dispatch: { bizStep: 'shipping', disposition: 'in_transit' },
  deliver: { bizStep: 'arriving', disposition: 'active' }, // at the customer's site, in use on hire
  fill_seal: { bizStep: 'other', disposition: 'container_closed' }, // filled and sealed (no CBV filling step)
  discharge: { bizStep: 'other', disposition: 'container_open' }, // seals off, product drained
  fold: { bizStep: 'other', disposition: 'available' }, // folded flat, empty
  collect: { bizStep: 'collecting', disposition: 'in_transit' }, // picked up from the customer, on its way back
  quarantine: { bizStep: 'inspecting', disposition: 'non_conformant' }, // held until cleared or repaired
  send_to_repair: { bizStep: 'repairing', disposition: 'damaged' },
  release: { bizStep: 'inspecting', disposition: 'available' }, // cleared back into service
  retire: { bizStep: 'decommissioning', disposition: 'inactive' },
  mark_missing: { bizStep: 'other', disposition: 'unavailable' }, // not known to be stolen, only unaccounted for
  mark_found: { bizStep: 'other', disposition: 'available' },
  inspect: { bizStep: 'inspecting', disposition: 'conformant', dispositionOnFail: 'non_conformant' }, // periodic or after-repair test
};
