// The one status table, written out literally: a change to a word, an icon or a tone shows up here.
// Every status carries a word and an icon (DESIGN §9: status is never colour alone).
import { describe, expect, it } from 'vitest';
import { STATUS_LOOK, TEST_LAPSED_LOOK, TONE_CLASSES, TONE_TEXT } from '@/lib/status-look';
import { STATUSES, STATUS_LABELS } from '@/lib/scans/lifecycle';

describe('STATUS_LOOK', () => {
  it('is the literal table', () => {
    const table = Object.fromEntries(Object.entries(STATUS_LOOK).map(([s, l]) => [s, `${l.icon}/${l.tone}`]));
    expect(table).toEqual({
      available: 'folded/good',
      prepared: 'lined/good',
      in_transit: 'truck/info',
      on_hire: 'handover/info',
      awaiting_collection: 'waiting/attention',
      quarantine: 'hold/fault',
      in_repair: 'wrench/attention',
      missing: 'question/fault',
      retired: 'retired/neutral',
    });
  });

  it('the "test lapsed" mark beside a status is a word and an icon too (issue 11 §3), not colour alone', () => {
    expect(TEST_LAPSED_LOOK).toEqual({ label: 'Test lapsed', icon: 'alert', tone: 'fault' });
    expect(TONE_CLASSES[TEST_LAPSED_LOOK.tone]).toBeDefined();
  });

  it('covers every status with its word', () => {
    expect(Object.keys(STATUS_LOOK).sort()).toEqual([...STATUSES].sort());
    for (const s of STATUSES) expect(STATUS_LOOK[s].label).toBe(STATUS_LABELS[s]);
  });

  it('has badge and text classes for every tone it uses', () => {
    for (const { tone } of Object.values(STATUS_LOOK)) {
      expect(TONE_CLASSES[tone]).toMatch(/^bg-\S+ text-ink border-\S+$/);
      expect(TONE_TEXT[tone]).toMatch(/^text-/);
    }
  });
});
