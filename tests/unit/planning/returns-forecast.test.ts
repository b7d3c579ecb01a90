import { describe, expect, it } from 'vitest';
import { binomialDistribution } from 'simple-statistics';
import {
  curveFor,
  dailyReturnProbabilities,
  fitReturnModel,
  forecastReturns,
  kaplanMeier,
  poissonBinomial,
  probabilityBackBy,
  quantileOf,
  survivalAt,
  usualReturnDepots,
} from '@/lib/planning/returns-forecast';
import type { HireSpell, TripHistoryRecord } from '@/lib/planning/returns-forecast';

// A textbook-style censored data set: the 21 remission times of the treated group in Gehan (1965), used as
// the first Kaplan–Meier example of many survival-analysis texts. Read here as "days on hire", a "+" time
// being a trip still open: 6 6 6 6+ 7 9+ 10 10+ 11+ 13 16 17+ 19+ 20+ 22 23 25+ 32+ 32+ 34+ 35+.
const RETURNED = [6, 6, 6, 7, 10, 13, 16, 22, 23];
const OPEN = [6, 9, 10, 11, 17, 19, 20, 25, 32, 32, 34, 35];
const SPELLS: HireSpell[] = [...RETURNED.map((days) => ({ days, returned: true })), ...OPEN.map((days) => ({ days, returned: false }))];

describe('kaplanMeier', () => {
  it('reproduces the Kaplan–Meier table worked by hand (Gehan 1965 data, 9 returns, 12 censored)', () => {
    const km = kaplanMeier(SPELLS);
    // Worked by hand: at each day, S ← S × (1 − returned / at risk); censored trips leave the risk set after
    // the day they were last seen out.
    const table: [day: number, atRisk: number, returned: number, censored: number, survival: number][] = [
      [6, 21, 3, 1, 18 / 21],
      [7, 17, 1, 0, (18 / 21) * (16 / 17)],
      [9, 16, 0, 1, (18 / 21) * (16 / 17)],
      [10, 15, 1, 1, (18 / 21) * (16 / 17) * (14 / 15)],
      [11, 13, 0, 1, (18 / 21) * (16 / 17) * (14 / 15)],
      [13, 12, 1, 0, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12)],
      [16, 11, 1, 0, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11)],
      [17, 10, 0, 1, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11)],
      [19, 9, 0, 1, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11)],
      [20, 8, 0, 1, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11)],
      [22, 7, 1, 0, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11) * (6 / 7)],
      [23, 6, 1, 0, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11) * (6 / 7) * (5 / 6)],
      [25, 5, 0, 1, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11) * (6 / 7) * (5 / 6)],
      [32, 4, 0, 2, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11) * (6 / 7) * (5 / 6)],
      [34, 2, 0, 1, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11) * (6 / 7) * (5 / 6)],
      [35, 1, 0, 1, (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11) * (6 / 7) * (5 / 6)],
    ];
    expect(km.rows.map((r) => [r.day, r.atRisk, r.returned, r.censored])).toEqual(table.map((t) => t.slice(0, 4)));
    km.rows.forEach((r, i) => expect(r.survival).toBeCloseTo(table[i][4], 12));
    // The rounded values printed in the texts: 0.857, 0.807, 0.753, 0.690, 0.627, 0.538, 0.448.
    expect([6, 7, 10, 13, 16, 22, 23].map((t) => Number(survivalAt(km, t).toFixed(3)))).toEqual([0.857, 0.807, 0.753, 0.69, 0.627, 0.538, 0.448]);
  });

  it('agrees with a second opinion: SciPy 1.17.1 scipy.stats.ecdf on CensoredData (values computed once with it and pasted)', () => {
    // No Kaplan–Meier estimator was found among the npm registry's statistics packages, so the second opinion
    // is SciPy's, run outside the project: ecdf(CensoredData(uncensored=RETURNED, right=OPEN)).sf.evaluate(t).
    const scipy: [number, number][] = [
      [5, 1.0],
      [6, 0.8571428571428571],
      [7, 0.8067226890756302],
      [9, 0.8067226890756302],
      [10, 0.7529411764705881],
      [13, 0.6901960784313724],
      [16, 0.6274509803921567],
      [22, 0.53781512605042],
      [23, 0.4481792717086834],
      [35, 0.4481792717086834],
    ];
    const km = kaplanMeier(SPELLS);
    for (const [t, s] of scipy) expect(survivalAt(km, t), `S(${t})`).toBeCloseTo(s, 12);
  });

  it('conditional return: P(back within k more days | out a days) = 1 − S(a+k)/S(a)', () => {
    const km = kaplanMeier(SPELLS);
    // Out 7 days: S(7) = 288/357. Back within 6 more days (by day 13): 1 − S(13)/S(7) = 1 − (14/15)(11/12).
    expect(probabilityBackBy(km, 7, 6)).toBeCloseTo(1 - (14 / 15) * (11 / 12), 12);
    // Out 0 days: the unconditional 1 − S(k).
    expect(probabilityBackBy(km, 0, 10)).toBeCloseTo(1 - survivalAt(km, 10), 12);
    // Past the last return (day 23) the curve is flat: nothing more is expected back.
    expect(probabilityBackBy(km, 24, 30)).toBe(0);
    // Daily probabilities add up to the cumulative one.
    const daily = dailyReturnProbabilities(km, 7, 6)!;
    expect(daily.reduce((a, b) => a + b, 0)).toBeCloseTo(probabilityBackBy(km, 7, 6)!, 12);
    expect(daily[2]).toBeCloseTo((survivalAt(km, 9) - survivalAt(km, 10)) / survivalAt(km, 7), 12);
  });

  it('a bin out longer than every trip of its history has no forecast (S(a) = 0)', () => {
    const km = kaplanMeier([
      { days: 3, returned: true },
      { days: 5, returned: true },
    ]);
    expect(survivalAt(km, 5)).toBe(0);
    expect(probabilityBackBy(km, 6, 3)).toBeNull();
    expect(dailyReturnProbabilities(km, 6, 3)).toBeNull();
  });

  it('refuses malformed spells', () => {
    expect(() => kaplanMeier([{ days: -1, returned: true }])).toThrow(/spell 0/);
    expect(() => kaplanMeier([{ days: 1.5, returned: false }])).toThrow(RangeError);
  });
});

describe('poissonBinomial (sum of independent Bernoullis, exact)', () => {
  it('matches a distribution worked by hand for p = 0.5, 0.2, 0.1', () => {
    // P(0) = .5·.8·.9 = .36; P(3) = .5·.2·.1 = .01;
    // P(1) = .5·.8·.9 + .5·.2·.9 + .5·.8·.1 = .36 + .09 + .04 = .49; P(2) = 1 − .36 − .49 − .01 = .14.
    const d = poissonBinomial([0.5, 0.2, 0.1]);
    expect(d.offset).toBe(0);
    [0.36, 0.49, 0.14, 0.01].forEach((p, x) => expect(d.pmf[x]).toBeCloseTo(p, 14));
    expect(d.mean).toBeCloseTo(0.8, 14);
    expect(d.variance).toBeCloseTo(0.25 + 0.16 + 0.09, 14);
    expect(quantileOf(d, 0.1)).toBe(0);
    expect(quantileOf(d, 0.5)).toBe(1); // P(X ≤ 1) = .85
    expect(quantileOf(d, 0.9)).toBe(2); // P(X ≤ 2) = .99
  });

  it('with equal p it is the binomial: quantiles agree with simple-statistics (not used by the module)', () => {
    for (const [n, p] of [
      [40, 0.3],
      [12, 0.05],
      [200, 0.6],
    ] as const) {
      const d = poissonBinomial(Array(n).fill(p));
      const pmf = binomialDistribution(n, p) ?? [];
      expect(pmf.length).toBeGreaterThan(0);
      const quantile = (q: number) => {
        let c = 0;
        for (let x = 0; x < pmf.length; x++) {
          c += pmf[x];
          if (c >= q - 1e-12) return x;
        }
        return pmf.length - 1;
      };
      for (const q of [0.1, 0.5, 0.9]) expect(quantileOf(d, q), `n=${n} p=${p} q=${q}`).toBe(quantile(q));
      expect(d.mean).toBeCloseTo(n * p, 9);
    }
  });

  it('certain returns shift the count; impossible ones add nothing', () => {
    const d = poissonBinomial([1, 1, 0, 0.5]);
    expect(d.offset).toBe(2);
    expect(d.pmf).toEqual([0.5, 0.5]);
  });
});

describe('forecast per depot', () => {
  const trip = (siteKey: string, dispatchedOn: string, returnedOn: string | null, returnDepotKey: string | null = 'D1'): TripHistoryRecord => ({
    siteKey,
    binTypeKey: 'T',
    dispatchedOn,
    returnedOn,
    returnDepotKey,
  });

  it('fits from what was known on the forecast date only: later returns count as still out', () => {
    const trips = [trip('S', '2027-01-01', '2027-01-05'), trip('S', '2027-01-01', '2027-01-20'), trip('S', '2027-01-15', null)];
    const model = fitReturnModel(trips, '2027-01-10', { minReturns: 1 });
    // On 10 Jan: one trip back after 4 days; one out 9 days (it came back later, unknown yet); the third has
    // not left: 2 spells.
    expect(model.pooled.rows).toEqual([
      { day: 4, atRisk: 2, returned: 1, censored: 0, survival: 0.5 },
      { day: 9, atRisk: 1, returned: 0, censored: 1, survival: 0.5 },
    ]);
  });

  it('uses the most specific curve with enough returns', () => {
    const trips = [
      ...Array.from({ length: 3 }, () => trip('A', '2027-01-01', '2027-01-03')),
      { ...trip('A', '2027-01-01', '2027-01-09'), binTypeKey: 'U' },
      trip('B', '2027-01-01', '2027-01-30'),
    ];
    const model = fitReturnModel(trips, '2027-02-01', { minReturns: 3 });
    expect(curveFor(model, 'A', 'T').level).toBe('site and bin type');
    expect(curveFor(model, 'A', 'U').level).toBe('site');
    expect(curveFor(model, 'B', 'T').level).toBe('all sites');
  });

  it('sums the bins out at each depot: expected returns per day and cumulative, with the exact band', () => {
    // History at one site: 10 trips came back after 2 days, 10 after 4 days.
    const history = [...Array.from({ length: 10 }, () => trip('S', '2027-01-01', '2027-01-03')), ...Array.from({ length: 10 }, () => trip('S', '2027-01-01', '2027-01-05'))];
    const model = fitReturnModel(history, '2027-02-01', { minReturns: 1 });
    // S(2) = 1/2, S(4) = 0. A bin out 1 day: back on day +1 (its 2nd day) w.p. 1/2, on day +3 w.p. 1/2.
    // A bin out 3 days: S(3) = 1/2, so it is back on day +1 (its 4th day) for sure.
    const binsOut = [
      ...Array.from({ length: 4 }, () => ({ depotKey: 'D1', siteKey: 'S', binTypeKey: 'T', dispatchedOn: '2027-01-31' })),
      { depotKey: 'D2', siteKey: 'S', binTypeKey: 'T', dispatchedOn: '2027-01-29' },
      { depotKey: 'D2', siteKey: 'S', binTypeKey: 'T', dispatchedOn: '2026-12-01' }, // out 62 days: beyond history
    ];
    const [d1, d2] = forecastReturns(model, binsOut, { asOf: '2027-02-01', horizonDays: 3 });
    expect(d1.depotKey).toBe('D1');
    expect(d1.days.map((d) => d.date)).toEqual(['2027-02-02', '2027-02-03', '2027-02-04']);
    expect(d1.days.map((d) => d.expected)).toEqual([2, 0, 2]);
    // Day +1: Binomial(4, 1/2): P(X ≤ 0) = 1/16, P(X ≤ 1) = 5/16 → 10 % quantile 1; P(X ≤ 3) = 15/16 → 90 % is 3.
    expect([d1.days[0].low, d1.days[0].high]).toEqual([1, 3]);
    expect([d1.days[1].low, d1.days[1].high]).toEqual([0, 0]);
    // By day +3 all four are back for sure.
    expect(d1.days[2]).toMatchObject({ cumulativeExpected: 4, cumulativeLow: 4, cumulativeHigh: 4 });
    expect(d2).toMatchObject({ depotKey: 'D2', binsOut: 2, beyondHistory: 1 });
    expect(d2.days[0]).toMatchObject({ expected: 1, low: 1, high: 1 });
  });

  it('knows where each site usually returns its bins', () => {
    const trips = [
      trip('S', '2027-01-01', '2027-01-03', 'D2'),
      trip('S', '2027-01-01', '2027-01-04', 'D2'),
      trip('S', '2027-01-01', '2027-01-04', 'D1'),
      trip('R', '2027-01-01', null, null),
    ];
    const m = usualReturnDepots(trips, '2027-02-01');
    expect(m.get('S')).toBe('D2');
    expect(m.has('R')).toBe(false);
  });

  it('refuses a bad horizon, band or date', () => {
    const model = fitReturnModel([], '2027-02-01');
    expect(() => forecastReturns(model, [], { asOf: '2027-02-01', horizonDays: 0 })).toThrow(/horizonDays/);
    expect(() => forecastReturns(model, [], { asOf: '2027-02-01', horizonDays: 5, band: [0.9, 0.1] })).toThrow(/band/);
    expect(() => fitReturnModel([], '2027-02-30')).toThrow(/asOf/);
    expect(() => forecastReturns(model, [{ depotKey: 'D', siteKey: 'S', binTypeKey: 'T', dispatchedOn: '2027-03-01' }], { asOf: '2027-02-01', horizonDays: 5 })).toThrow(/bin 0/);
  });
});
