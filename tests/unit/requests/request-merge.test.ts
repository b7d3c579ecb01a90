// Which request a new collection report joins, as a literal table (the rule is common practice for request
// queues, no published source): the same bin, or the same site, within 72 hours of the latest report.
import { describe, test, expect } from 'vitest';
import { MERGE_WINDOW_HOURS, mergeTarget, type OpenRequest } from '@/lib/requests/request-merge';

const NOW = new Date('2026-12-04T12:00:00Z');
const hoursAgo = (h: number) => new Date(NOW.getTime() - h * 3_600_000);
const OPEN: OpenRequest[] = [
  { id: 1, assetId: 10, siteId: 5, status: 'open', lastReportedAt: hoursAgo(2) },
  { id: 2, assetId: null, siteId: 5, status: 'scheduled', lastReportedAt: hoursAgo(30) },
  { id: 3, assetId: 11, siteId: 5, status: 'done', lastReportedAt: hoursAgo(1) },
  { id: 4, assetId: 12, siteId: 6, status: 'open', lastReportedAt: hoursAgo(MERGE_WINDOW_HOURS + 1) },
  { id: 5, assetId: null, siteId: 5, status: 'open', lastReportedAt: hoursAgo(5) },
];

describe('merging collection reports', () => {
  test.each([
    [{ assetId: 10, siteId: 5 }, 1], // same bin, 2 h ago
    [{ assetId: 13, siteId: 5 }, 1], // another bin at the same site: the site's newest open request (1, 2 h ago)
    [{ assetId: 11, siteId: 8 }, null], // that bin's request is done, and nothing open at site 8
    [{ assetId: 12, siteId: 6 }, null], // 73 h since its latest report
    [{ assetId: null, siteId: 5 }, 1], // the site: its newest open request
    [{ assetId: null, siteId: 7 }, null],
    [{ assetId: null, siteId: null }, null],
  ])('%j joins %s', (incoming, expected) => {
    expect(mergeTarget(OPEN, incoming, NOW)?.id ?? null).toBe(expected);
  });
  test('exactly at the window it no longer joins', () => {
    expect(mergeTarget([{ ...OPEN[0]!, lastReportedAt: hoursAgo(MERGE_WINDOW_HOURS) }], { assetId: 10, siteId: 5 }, NOW)).toBeNull();
  });
});
