import type { Action } from '@/lib/scans/lifecycle';

/**
 * The usual cautions shown where a screen guides handling. Loopfold does not
 * replace local regulations, the product's safety data sheet or the site's
 * licensed procedures; every caution says so.
 */
export const DEFER = 'Follow local regulations, the product’s safety data sheet and your site’s procedures; they take precedence over this screen.';

const UNFOLD =
  'Pinch points: keep fingers clear of hinges and panel edges while unfolding; lock every panel before you let go. Lift with a forklift or a second person, never alone.';
const FOLD = 'Pinch points: fold panels in the order marked on the bin, keep hands on the handles, and make sure the bin is empty and drained first.';

export const CAUTIONS: Partial<Record<Action, string[]>> = {
  prep_check: [UNFOLD, 'Wear cut-resistant gloves when feeling inner walls and the floor for sharp edges.'],
  fit_liner: ['Seat the liner valve fully in the discharge port before closing up; do not lean into the bin.'],
  dispatch: ['Forklift zone: stay out of the truck bay while bins are loaded; check stack height against the bin’s stacking mark.'],
  fill_seal: [
    'Never fill above the safe fill level for the product and its temperature; check the maximum gross mass on the UN mark.',
    'Wear the PPE the product’s safety data sheet asks for.',
  ],
  discharge: [
    'Check seal numbers and the product label before opening anything. Connect the discharge coupling before opening the valve; wear the PPE the safety data sheet asks for.',
  ],
  fold: [FOLD],
  receive: ['Forklift zone: unload folded stacks only from a stable vehicle; check stacks for loose panels before lifting.'],
  collect: ['Load folded bins flat and strapped; do not stack above the marked limit.'],
  inspect: [
    'Leakproofness test: pressurise with air through a regulator and a relief valve set for the test pressure; never go above the pressure the bin’s design type allows. Stand clear of the lid, valve and closures while it is under pressure, and let the pressure off before loosening any fitting.',
    'Test only an empty, cleaned and drained bin; check the last product’s safety data sheet for residues before you reach inside. Wear eye protection and cut-resistant gloves.',
  ],
  quarantine: ['Mark the bin clearly and move it to the quarantine bay; do not stack other bins on it.'],
};

export function cautionsFor(action: Action): string[] {
  return CAUTIONS[action] ?? [];
}
