// The site picture's projection and circle sizes.
// Equirectangular (equidistant cylindrical) projection, x = R(λ − λ0) cos φ1, y = R(φ − φ0): J. P. Snyder,
// "Map Projections — A Working Manual", USGS Professional Paper 1395 (1987), chapter on the equidistant
// cylindrical projection [memory]. The checks use exact trigonometry (cos 60° = 1/2, cos 0° = 1), so they
// do not lean on the module's own numbers. Circle area ∝ count means r ∝ √count (area = πr²).
import { describe, test, expect } from 'vitest';
import { circleRadius, fitProjection, placeLabels } from '@/lib/fleet/site-map.ts';

const frame = { width: 600, height: 400, padding: 20 };

describe('equirectangular projection fitted to the frame', () => {
  test('at a standard parallel of 60°, a degree of longitude is drawn half as long as a degree of latitude', () => {
    // Points 59.5°–60.5° N, 0°–1° E: the middle latitude is 60°, cos 60° = 0.5.
    const points = [
      { lat: 59.5, lon: 0 },
      { lat: 60.5, lon: 0 },
      { lat: 60, lon: 1 },
    ];
    const p = fitProjection(points, frame);
    expect(p.standardParallel).toBe(60);
    const a = p.project({ lat: 60, lon: 0 });
    const east = p.project({ lat: 60, lon: 1 });
    const north = p.project({ lat: 60.5, lon: 0 });
    const south = p.project({ lat: 59.5, lon: 0 });
    expect(east.x - a.x).toBeCloseTo(0.5 * (south.y - north.y), 9);
    expect(east.y).toBeCloseTo(a.y, 9); // a parallel is a horizontal line
  });

  test('north is up, east is right, and the points fill the frame inside its padding with one scale', () => {
    // At the equator cos 0° = 1: 2° of longitude × 1° of latitude is a 2:1 box; the frame inside the padding
    // is 560 × 360, so the width decides: 280 px per degree, and the 280 px tall picture is centred vertically.
    const p = fitProjection(
      [
        { lat: -0.5, lon: 10 },
        { lat: 0.5, lon: 12 },
      ],
      frame,
    );
    expect(p.pixelsPerDegree).toBeCloseTo(280, 9);
    const sw = p.project({ lat: -0.5, lon: 10 });
    const ne = p.project({ lat: 0.5, lon: 12 });
    expect(sw.x).toBeCloseTo(20, 9);
    expect(ne.x).toBeCloseTo(580, 9);
    expect(ne.y).toBeCloseTo(20 + (360 - 280) / 2, 9); // 60
    expect(sw.y).toBeCloseTo(60 + 280, 9);
  });

  test('one site, or none, sits in the middle', () => {
    expect(fitProjection([{ lat: 51.9, lon: 4.3 }], frame).project({ lat: 51.9, lon: 4.3 })).toEqual({ x: 300, y: 200 });
    expect(fitProjection([], frame).project({ lat: 0, lon: 0 })).toEqual({ x: 300, y: 200 });
  });

  test('a frame with no room inside the padding is refused', () => {
    expect(() => fitProjection([], { width: 30, height: 30, padding: 20 })).toThrow(RangeError);
  });
});

describe('circle area proportional to the count', () => {
  test('four times the bins, twice the radius (four times the area); the largest gets the full radius', () => {
    expect(circleRadius(100, 100, 30)).toBe(30);
    expect(circleRadius(25, 100, 30)).toBe(15);
    const small = circleRadius(10, 90, 24);
    const big = circleRadius(40, 90, 24);
    expect((Math.PI * big ** 2) / (Math.PI * small ** 2)).toBeCloseTo(4, 12);
  });

  test('no bins: no circle; negative input refused', () => {
    expect(circleRadius(0, 50, 30)).toBe(0);
    expect(circleRadius(0, 0, 30)).toBe(0);
    expect(() => circleRadius(-1, 50, 30)).toThrow(RangeError);
  });
});

describe('labels', () => {
  test('a lone label goes to the right of its circle, inside the frame', () => {
    const [placed] = placeLabels([{ x: 100, y: 100, radius: 10, text: 'DEP-RTM' }], frame);
    expect(placed).toMatchObject({ side: 'right', anchor: 'start', x: 113 });
  });

  test('near the right edge the label moves to the left', () => {
    const [placed] = placeLabels([{ x: 590, y: 100, radius: 5, text: 'DEP-DUI' }], frame);
    expect(placed!.side).toBe('left');
  });

  test('two sites almost on one spot get labels that do not overlap', () => {
    const marks = [
      { x: 300, y: 200, radius: 12, text: 'HAL-ZWD' },
      { x: 302, y: 208, radius: 6, text: 'HAL-MDK' },
    ];
    const [a, b] = placeLabels(marks, frame);
    const apart = a!.box.right <= b!.box.left || b!.box.right <= a!.box.left || a!.box.bottom <= b!.box.top || b!.box.bottom <= a!.box.top;
    expect(apart).toBe(true);
  });
});
