// Hand-worked values: a scan recorded at 10:00:00 with a 30 s window.
import { describe, test, expect } from 'vitest';
import { recordedWords, undoSecondsLeft } from '@/lib/scans/undo-window';

const at = new Date('2026-12-03T10:00:00Z');
const plus = (ms: number) => new Date(at.getTime() + ms);

describe('undo window', () => {
  test('counts whole seconds down to 0', () => {
    expect(undoSecondsLeft(at, at, 30)).toBe(30);
    expect(undoSecondsLeft(at, plus(200), 30)).toBe(30); // 29.8 s left shows as 30
    expect(undoSecondsLeft(at, plus(29_001), 30)).toBe(1);
    expect(undoSecondsLeft(at, plus(30_000), 30)).toBe(0);
    expect(undoSecondsLeft(at, plus(90_000), 30)).toBe(0);
  });
  test('0 turns undo off; a clock behind the recording still offers the full window', () => {
    expect(undoSecondsLeft(at, at, 0)).toBe(0);
    expect(undoSecondsLeft(at, plus(-5_000), 30)).toBe(30);
    expect(undoSecondsLeft('not a date', at, 30)).toBe(0);
  });
  test('the confirmation says what was recorded and the new status', () => {
    expect(recordedWords('Prep check', 'Prepared')).toBe('Prep check recorded. The bin is now prepared.');
  });
});
