// Dealing the browser files to lanes: longest first to the least-loaded lane (LPT, Graham 1969), hand-worked.
import { describe, expect, test } from 'vitest';
import { dealFiles, laneWallTimes } from '@/cli/browser-lanes.mjs';

describe('dealFiles', () => {
  test('LPT on a hand-worked case: 7, 5, 4, 3, 3 s over two lanes → 7 + 3 and 5 + 4 + 3', () => {
    const timings = { a: 3, b: 5, c: 7, d: 4, e: 3 };
    const lanes = dealFiles(['a', 'b', 'c', 'd', 'e'], 2, timings);
    // c 7 → lane 1 (7); b 5 → lane 2 (5); d 4 → lane 2 (5 < 7: 9); a 3 → lane 1 (7 < 9: 10); e 3 → lane 2 (9 < 10: 12)
    expect(lanes.map((l) => l.seconds)).toEqual([10, 12]);
    expect(lanes.map((l) => l.files)).toEqual([
      ['a', 'c'],
      ['b', 'd', 'e'],
    ]);
  });

  test('files without a timing weigh the median of the known ones', () => {
    const lanes = dealFiles(['x', 'y', 'z'], 2, { x: 10, y: 2 });
    // known sorted [2, 10], median index 1 → 10: z weighs 10
    expect(lanes.map((l) => l.seconds).sort((p, q) => p - q)).toEqual([10, 12]);
  });

  test('no more lanes than files, every file exactly once', () => {
    const lanes = dealFiles(['only'], 3, {});
    expect(lanes).toHaveLength(1);
    expect(lanes[0]!.files).toEqual(['only']);
    const many = dealFiles(['a', 'b', 'c', 'd'], 2, {});
    expect(many.flatMap((l) => l.files).sort()).toEqual(['a', 'b', 'c', 'd']);
  });
});

describe('laneWallTimes', () => {
  test('each file weighs from the end of the one before it, so its module collection counts (hand-worked)', () => {
    // a runs 0–10 s; b is collected 10–40 s and runs 40–45 s; c starts at once, 45–47 s
    const results = [
      { name: '/p/tests/browser/b.test.ts', startTime: 40_000, endTime: 45_000 },
      { name: '/p/tests/browser/a.test.ts', startTime: 0, endTime: 10_000 },
      { name: '/p/tests/browser/c.test.ts', startTime: 45_000, endTime: 47_000 },
      { name: '/p/tests/browser/never-ran.test.ts' },
    ];
    expect(laneWallTimes('/p', results)).toEqual({ 'tests/browser/a.test.ts': 10, 'tests/browser/b.test.ts': 35, 'tests/browser/c.test.ts': 2 });
  });
});
