// What the public page offers per status, as a literal table of every status of the lifecycle (lifecycle.ts).
import { describe, test, expect } from 'vitest';
import { offersCollection } from '@/lib/requests/public-offer';
import type { Status } from '@/lib/scans/lifecycle';

const TABLE: Record<Status, boolean> = {
  available: false,
  prepared: false,
  in_transit: false,
  on_hire: true,
  awaiting_collection: true,
  quarantine: false,
  in_repair: false,
  missing: true,
  retired: false,
};

describe('the public page offers a collection only where there can be one', () => {
  test.each(Object.entries(TABLE) as Array<[Status, boolean]>)('%s → %s', (status, offered) => {
    expect(offersCollection(status)).toBe(offered);
  });
});
