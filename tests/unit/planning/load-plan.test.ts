import { describe, test, expect } from 'vitest';
import {
  STANDARD_TRAILER,
  binsAllowedOnTop,
  floorPositions,
  loadCapacity,
  stackLevelsByHeight,
  type BinForLoading,
  type LoadCapacity,
  type LoadPlanError,
  type Trailer,
} from '@/lib/planning/load-plan';

function ok(result: LoadCapacity | LoadPlanError): LoadCapacity {
  if (!result.ok) throw new Error(`expected a capacity, got: ${result.message}`);
  return result;
}

// The published composite mark of UN Model Regulations 6.5.2.1.2 (REFERENCES §2).
const PUBLISHED_COMPOSITE = '31HA1/Y/05 01/D/Muller 1683/10800/1200';

// An invented foldable bin like the demo's: 1200 × 1000 footprint, 380 mm folded, 1160 mm erected.
const FOLDABLE: BinForLoading = {
  footprint: { lengthMm: 1200, widthMm: 1000 },
  heightErectedMm: 1160,
  heightFoldedMm: 380,
  tareKg: 85,
  maxGrossKg: 1200,
  unMarking: PUBLISHED_COMPOSITE,
};

describe('floor positions on a 13.6 × 2.45 m trailer (REFERENCES §9, common practice)', () => {
  test('26 positions of 1200 × 1000: 2 across × 13 rows, the 1000 mm side along the trailer', () => {
    const plan = floorPositions(STANDARD_TRAILER, { lengthMm: 1200, widthMm: 1000 });
    expect(plan.positions).toBe(26);
    expect(plan.rowsAcross).toBe(13);
    expect(plan.binsPerRowAcross).toBe(2);
    expect(plan.rowsAlong).toBe(0);
    // The other orientation on its own: 1210 mm rows → 11 rows × 2 (2450 / 1010) = 22.
    expect(plan.allAlong).toBe(22);
    expect(plan.allAcross).toBe(26);
  });

  test('33 positions of 1200 × 800: 3 across × 11 rows, the 1200 mm side along the trailer', () => {
    const plan = floorPositions(STANDARD_TRAILER, { lengthMm: 1200, widthMm: 800 });
    expect(plan.positions).toBe(33);
    expect(plan.rowsAlong).toBe(11);
    expect(plan.binsPerRowAlong).toBe(3);
    // Turned: 810 mm rows → 16 rows (12,960 mm) × 2 = 32.
    expect(plan.allAcross).toBe(32);
  });

  test('the footprint may be given either way round', () => {
    expect(floorPositions(STANDARD_TRAILER, { lengthMm: 1000, widthMm: 1200 }).positions).toBe(26);
    expect(floorPositions(STANDARD_TRAILER, { lengthMm: 800, widthMm: 1200 }).positions).toBe(33);
  });

  test('without play, 17 rows of 800 mm fill 13,600 mm exactly and give 34 (hand-worked): the play is what keeps the count honest', () => {
    expect(floorPositions(STANDARD_TRAILER, { lengthMm: 1200, widthMm: 800 }, 0).positions).toBe(34);
  });

  test('rows of both orientations mix when the leftover length takes a turned row (hand-worked)', () => {
    // 12,950 mm trailer, 1200 × 800: 10 rows of 3 (12,100 mm) leave 850 mm, room for one row of 2 turned
    // bins (810 mm): 32. All one way: 10 × 3 = 30, or 15 × 2 = 30 (15 × 810 = 12,150).
    const trailer: Trailer = { ...STANDARD_TRAILER, insideLengthMm: 12_950 };
    const plan = floorPositions(trailer, { lengthMm: 1200, widthMm: 800 });
    expect(plan.positions).toBe(32);
    expect(plan.rowsAlong).toBe(10);
    expect(plan.rowsAcross).toBe(1);
    expect(plan.usedLengthMm).toBe(12_910);
    expect(plan.allAlong).toBe(30);
    expect(plan.allAcross).toBe(30);
  });

  test('a footprint wider than the trailer has no position', () => {
    expect(floorPositions(STANDARD_TRAILER, { lengthMm: 2500, widthMm: 2500 }).positions).toBe(0);
  });
});

describe('stack levels by height (hand-worked)', () => {
  test('folded 380 mm under 2700 mm with 50 mm head room: 2650 / 380 = 6.97 → 6 levels', () => {
    expect(stackLevelsByHeight(2700, 380)).toBe(6);
  });
  test('erected 1160 mm: 2650 / 1160 = 2.28 → 2 levels', () => {
    expect(stackLevelsByHeight(2700, 1160)).toBe(2);
  });
  test('exactly at the limit: 5 × 530 = 2650 → 5 levels; one millimetre more → 4', () => {
    expect(stackLevelsByHeight(2700, 530)).toBe(5);
    expect(stackLevelsByHeight(2700, 531)).toBe(4);
  });
});

describe('stacking test load (UN Model Regulations 6.5.6.6.4, 6.5.2.1.2)', () => {
  test('…/10800/1200: 10800 / (1.8 × 1200) = 5 bins on top', () => {
    expect(binsAllowedOnTop(10_800, 1_200)).toBe(5);
  });
  test('lighter bins: 10800 / (1.8 × 1000) = 6', () => {
    expect(binsAllowedOnTop(10_800, 1_000)).toBe(6);
  });
  test('just over: 10800 / (1.8 × 1200.1) = 4.9996 → 4', () => {
    expect(binsAllowedOnTop(10_800, 1_200.1)).toBe(4);
  });
  test('0 kg = not designed for stacking', () => {
    expect(binsAllowedOnTop(0, 1_200)).toBe(0);
  });
});

describe('trailer capacity with the limiting factor', () => {
  test('folded empties: 26 positions × 6 levels = 156, limited by space (hand-worked)', () => {
    const cap = ok(loadCapacity(STANDARD_TRAILER, FOLDABLE, { kind: 'folded' }));
    expect(cap.bins).toBe(156);
    expect(cap.levels).toBe(6);
    expect(cap.limitedBy).toBe('space');
    // 156 × 85 kg = 13,260 kg, under the 24 t payload.
    expect(cap.loadMassKg).toBe(13_260);
    expect(cap.binsByPayload).toBe(282);
    expect(cap.explanation).toContain('floor space and inside height');
  });

  test('erected empties: 26 × 2 = 52', () => {
    const cap = ok(loadCapacity(STANDARD_TRAILER, FOLDABLE, { kind: 'erected-empty' }));
    expect(cap.bins).toBe(52);
    expect(cap.limitedBy).toBe('space');
  });

  test('a level limit given by the site caps folded stacks: 26 × 4 = 104', () => {
    const cap = ok(loadCapacity(STANDARD_TRAILER, FOLDABLE, { kind: 'folded' }, { maxLevels: 4 }));
    expect(cap.bins).toBe(104);
    expect(cap.limitedBy).toBe('level-limit');
  });

  test('filled at 1200 kg: the mark allows 6 levels, height 2, payload 24,000 / 1200 = 20 → 20 bins, limited by payload', () => {
    const cap = ok(loadCapacity(STANDARD_TRAILER, FOLDABLE, { kind: 'filled', grossKgPerBin: 1_200 }));
    expect(cap.levelsByStackingLoad).toBe(6);
    expect(cap.levelsByHeight).toBe(2);
    expect(cap.binsBySpace).toBe(52);
    expect(cap.binsByPayload).toBe(20);
    expect(cap.bins).toBe(20);
    expect(cap.limitedBy).toBe('payload');
    expect(cap.loadMassKg).toBe(24_000);
  });

  test('filled bins whose mark says 0 kg are not stacked: 26 × 1 at 800 kg (payload would take 30)', () => {
    const bin = { ...FOLDABLE, unMarking: '31HA2/Z/03 24/D/Faltwerk 12/0/1200' };
    const cap = ok(loadCapacity(STANDARD_TRAILER, bin, { kind: 'filled', grossKgPerBin: 800 }));
    expect(cap.levels).toBe(1);
    expect(cap.bins).toBe(26);
    expect(cap.limitedBy).toBe('stacking-test-load');
    expect(cap.explanation).toContain('not designed for stacking');
  });

  test('a tall trailer: the mark, not the height, limits a filled stack (hand-worked)', () => {
    // 3600 mm inside: (3600 − 50) / 1160 = 3.06 → 3 levels; mark 2160 kg / (1.8 × 1200) = 1 on top → 2 levels.
    const tall: Trailer = { ...STANDARD_TRAILER, insideHeightMm: 3_600, payloadKg: 80_000 };
    const bin = { ...FOLDABLE, unMarking: '31HA1/Y/03 24/D/Faltwerk 12/2160/1200' };
    const cap = ok(loadCapacity(tall, bin, { kind: 'filled', grossKgPerBin: 1_200 }));
    expect(cap.levelsByHeight).toBe(3);
    expect(cap.levels).toBe(2);
    expect(cap.bins).toBe(52);
    expect(cap.limitedBy).toBe('stacking-test-load');
  });

  test('filled bins without a UN mark are not stacked', () => {
    const cap = ok(loadCapacity(STANDARD_TRAILER, { ...FOLDABLE, unMarking: null }, { kind: 'filled', grossKgPerBin: 800 }));
    expect(cap.levels).toBe(1);
    expect(cap.explanation).toContain('no UN mark');
  });

  test('refusals say what is wrong', () => {
    const over = loadCapacity(STANDARD_TRAILER, FOLDABLE, { kind: 'filled', grossKgPerBin: 1_250 });
    expect(over).toEqual({ ok: false, message: expect.stringContaining('maximum gross mass of 1200 kg') });
    const light = loadCapacity(STANDARD_TRAILER, FOLDABLE, { kind: 'filled', grossKgPerBin: 50 });
    expect(light.ok).toBe(false);
    const noTrailer = loadCapacity({ ...STANDARD_TRAILER, insideHeightMm: Number.NaN }, FOLDABLE, { kind: 'folded' });
    expect(noTrailer).toEqual({ ok: false, message: expect.stringContaining('trailer inside height') });
    expect(loadCapacity(STANDARD_TRAILER, FOLDABLE, { kind: 'folded' }, { maxLevels: 0 }).ok).toBe(false);
  });
});
