import { describe, test, expect } from 'vitest';
import {
  DG_NOT_CHECKED,
  checkDangerousGoods,
  checkGrossMass,
  maxFillPercentByBoilingPoint,
  maxFillPercentByFormula,
  planFill,
  volumeFromMass,
  type FillPlan,
} from '@/lib/planning/filling';

// Water (REFERENCES §3): d15 = 0.999099 g/mL (CRC Handbook of Chemistry and Physics, density of water
// table), d50 = 0.98803 g/mL (ITS-90 water density equation).
const WATER = { d15: 0.999099, d50: 0.98803 };

function percent(fillTempC: number): number {
  const result = maxFillPercentByFormula({ ...WATER, fillTempC });
  if (!result.ok) throw new Error(result.message);
  return result.percent;
}

function plan(result: ReturnType<typeof planFill>): FillPlan {
  if (!result.ok) throw new Error(result.message);
  return result.plan;
}

describe('ADR 4.1.1.4 (b) formula, worked water example of REFERENCES §3', () => {
  test('α = (d15 − d50) / (35 × d50) = 3.20 × 10⁻⁴ /K', () => {
    const result = maxFillPercentByFormula({ ...WATER, fillTempC: 20 });
    expect(result.ok && result.alphaPerK).toBeCloseTo(3.2e-4, 6);
  });
  test('96.91 % at 15 °C', () => expect(percent(15)).toBeCloseTo(96.91, 2));
  test('97.07 % at 20 °C', () => expect(percent(20)).toBeCloseTo(97.07, 2));
  test('97.22 % at 25 °C', () => expect(percent(25)).toBeCloseTo(97.22, 2));
  test('98 % at a mean bulk temperature of 50 °C, whatever the liquid (ADR 4.1.1.4)', () => {
    expect(percent(50)).toBe(98);
    expect(maxFillPercentByFormula({ d15: 0.8, d50: 0.76, fillTempC: 50 })).toMatchObject({ ok: true, percent: 98 });
  });
  test('a 1000 L bin filled with water at 20 °C holds at most 970.7 L (§3)', () => {
    const p = plan(
      planFill({
        capacityL: 1000,
        tareKg: 85,
        maxGrossKg: 1200,
        fillTempC: 20,
        densityKgPerL: 0.9982,
        limit: { method: 'formula', ...WATER },
        target: { volumeL: 970 },
      }),
    );
    expect(p.maxFillL).toBeCloseTo(970.7, 1);
    expect(p.fits).toBe(true);
    expect(p.limitBasis).toContain('4.1.1.4 (b)');
  });
  test('bad figures are refused with a reason', () => {
    expect(maxFillPercentByFormula({ d15: 0.98, d50: 0.99, fillTempC: 20 })).toMatchObject({ ok: false });
    expect(maxFillPercentByFormula({ d15: 0, d50: 0.99, fillTempC: 20 })).toMatchObject({ ok: false });
    expect(maxFillPercentByFormula({ ...WATER, fillTempC: 60 })).toMatchObject({
      ok: false,
      message: expect.stringContaining('50 °C'),
    });
    expect(maxFillPercentByFormula({ ...WATER, fillTempC: Number.NaN })).toMatchObject({ ok: false });
  });
});

describe('ADR 4.1.1.4 (a) boiling-point table, its edges', () => {
  const cases: [number, number][] = [
    [-10, 90],
    [59.9, 90],
    [60, 92],
    [99.9, 92],
    [100, 94],
    [199.9, 94],
    [200, 96],
    [299.9, 96],
    [300, 98],
    [450, 98],
  ];
  test.each(cases)('initial boiling point %s °C → %s %%', (ibp, expected) => {
    expect(maxFillPercentByBoilingPoint(ibp)).toMatchObject({ ok: true, percent: expected });
  });
  test('not a number is refused', () => {
    expect(maxFillPercentByBoilingPoint(Number.NaN).ok).toBe(false);
  });
  test('the table is for filling at 15 °C only: at 20 °C the planner is sent to the formula', () => {
    const result = planFill({
      capacityL: 1000,
      tareKg: 85,
      maxGrossKg: 1200,
      fillTempC: 20,
      densityKgPerL: 1,
      limit: { method: 'boiling-point', initialBoilingPointC: 150 },
      target: { volumeL: 900 },
    });
    expect(result).toMatchObject({ ok: false, message: expect.stringContaining('15 °C') });
  });
});

describe('volume, mass and gross mass (hand-worked)', () => {
  test('1150 kg of a liquid at 1.15 kg/L is 1000 L', () => {
    expect(volumeFromMass(1150, 1.15)).toBeCloseTo(1000, 9);
  });
  test('85 kg tare + 1100 kg is 1185 kg, 15 kg under 1200 kg', () => {
    expect(checkGrossMass(85, 1100, 1200)).toMatchObject({ grossKg: 1185, marginKg: 15, fits: true });
  });
  test('85 kg tare + 1150 kg is 35 kg over 1200 kg', () => {
    const check = checkGrossMass(85, 1150, 1200);
    expect(check.fits).toBe(false);
    expect(check.message).toContain('35 kg over');
  });
  test('a dense product is stopped by the gross mass before the fill level', () => {
    // 1.4 kg/L, boiling point 250 °C, at 15 °C: 96 % of 1000 L = 960 L = 1344 kg, but 1200 − 85 = 1115 kg.
    const p = plan(
      planFill({
        capacityL: 1000,
        tareKg: 85,
        maxGrossKg: 1200,
        fillTempC: 15,
        densityKgPerL: 1.4,
        limit: { method: 'boiling-point', initialBoilingPointC: 250 },
        target: { massKg: 1200 },
      }),
    );
    expect(p.maxFillPercent).toBe(96);
    expect(p.maxFillL).toBeCloseTo(960, 9);
    expect(p.maxProductKg).toBe(1115);
    expect(p.targetL).toBeCloseTo(857.14, 2);
    expect(p.fits).toBe(false);
    expect(p.problems).toEqual([expect.stringContaining('over the maximum of 1,200 kg')]);
  });
  test('a target above the fill level is refused; the liner temperature is checked', () => {
    const p = plan(
      planFill({
        capacityL: 1000,
        tareKg: 85,
        maxGrossKg: 1500,
        fillTempC: 20,
        densityKgPerL: 0.9982,
        limit: { method: 'formula', ...WATER },
        target: { volumeL: 980 },
        linerMaxFillTempC: 15,
      }),
    );
    expect(p.fits).toBe(false);
    expect(p.problems).toHaveLength(2);
    expect(p.problems[0]).toContain('over the maximum fill of 970.7 L');
    expect(p.problems[1]).toContain("liner's maximum of 15 °C");
    expect(p.cautions.join(' ')).toContain('safety data sheet');
  });
});

describe('dangerous goods: packing group against the mark (UN 6.5.2.1.1 X/Y/Z, 6.5.1.4 codes)', () => {
  // Published example of 6.5.2.1.2: composite IBC for liquids, letter Y.
  const PUBLISHED_COMPOSITE = '31HA1/Y/05 01/D/Muller 1683/10800/1200';
  test('Y admits packing groups II and III, not I', () => {
    expect(checkDangerousGoods(PUBLISHED_COMPOSITE, 2).fits).toBe(true);
    expect(checkDangerousGoods(PUBLISHED_COMPOSITE, 3).fits).toBe(true);
    const pgI = checkDangerousGoods(PUBLISHED_COMPOSITE, 1);
    expect(pgI.fits).toBe(false);
    expect(pgI.problems[0]).toContain('Packing group I is not allowed');
  });
  test('Z admits packing group III only', () => {
    const z = '31HA2/Z/03 24/D/Faltwerk 12/10800/1200';
    expect(checkDangerousGoods(z, 3).fits).toBe(true);
    expect(checkDangerousGoods(z, 2).fits).toBe(false);
  });
  test('a bin for solids (11A, published 6.5.2.1.2 example) is no bin for a liquid', () => {
    const check = checkDangerousGoods('11A/Y/02 99/NL/Mulder 007/5500/1500', 3);
    expect(check.fits).toBe(false);
    expect(check.problems[0]).toContain('not for liquids');
  });
  test('no mark: no dangerous goods; and the note of what is not checked is always there', () => {
    const check = checkDangerousGoods(null, 3);
    expect(check.fits).toBe(false);
    expect(check.notChecked).toBe(DG_NOT_CHECKED);
    expect(DG_NOT_CHECKED).toContain('packing instruction');
    expect(checkDangerousGoods(PUBLISHED_COMPOSITE, 3).notChecked).toContain('not checked');
  });
});
