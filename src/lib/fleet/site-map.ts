/**
 * A map-free picture of the sites: points placed by their coordinates, circles sized by how many bins are
 * there, labels that try not to sit on each other. No tiles, no map service — an SVG drawn on the page.
 *
 *   fitProjection(points, frame)          → project(point) → { x, y } in the frame's pixels
 *   circleRadius(count, maxCount, maxR)   → radius whose AREA is proportional to the count
 *   placeLabels(marks, frame, charWidth)  → a position for each label (right, left, above, below) avoiding overlaps
 *
 * Projection: equirectangular (equidistant cylindrical) with the standard parallel at the middle latitude of
 * the points, x = (λ − λ0) · cos φ1, y = φ — distances along that parallel and along meridians are true to
 * scale, which is plenty for a region a few hundred kilometres across. SVG y grows downwards, so north is up
 * by drawing φmax at the top. The picture keeps its aspect (one scale for both axes) and is centred.
 */

export interface GeoPoint {
  lat: number;
  lon: number;
}

export interface Frame {
  width: number;
  height: number;
  /** Room kept free on every side (for circles and labels at the edge). */
  padding: number;
}

export interface XY {
  x: number;
  y: number;
}

const DEG = Math.PI / 180;

export interface Projection {
  project(point: GeoPoint): XY;
  /** Pixels per degree of latitude (the same for a degree of longitude at the standard parallel × cos φ1). */
  pixelsPerDegree: number;
  standardParallel: number;
}

export function fitProjection(points: readonly GeoPoint[], frame: Frame): Projection {
  const innerW = frame.width - 2 * frame.padding;
  const innerH = frame.height - 2 * frame.padding;
  if (innerW <= 0 || innerH <= 0) throw new RangeError('The frame has no room inside its padding');
  if (points.length === 0) {
    return { project: () => ({ x: frame.width / 2, y: frame.height / 2 }), pixelsPerDegree: 0, standardParallel: 0 };
  }
  const lats = points.map((p) => p.lat);
  const lons = points.map((p) => p.lon);
  const minLat = Math.min(...lats);
  const maxLat = Math.max(...lats);
  const minLon = Math.min(...lons);
  const maxLon = Math.max(...lons);
  const standardParallel = (minLat + maxLat) / 2;
  const cosPhi1 = Math.cos(standardParallel * DEG);
  const spanX = (maxLon - minLon) * cosPhi1; // in "degrees of latitude"
  const spanY = maxLat - minLat;
  // One scale for both axes; a single point (or points on one spot) sits in the middle.
  const candidates = [spanX > 0 ? innerW / spanX : Infinity, spanY > 0 ? innerH / spanY : Infinity];
  const scale = Math.min(...candidates);
  const pixelsPerDegree = Number.isFinite(scale) ? scale : 0;
  const offsetX = frame.padding + (innerW - spanX * pixelsPerDegree) / 2;
  const offsetY = frame.padding + (innerH - spanY * pixelsPerDegree) / 2;
  return {
    project: ({ lat, lon }) => ({
      x: offsetX + (lon - minLon) * cosPhi1 * pixelsPerDegree,
      y: offsetY + (maxLat - lat) * pixelsPerDegree,
    }),
    pixelsPerDegree,
    standardParallel,
  };
}

/** Area ∝ count: r = maxRadius · √(count / maxCount). Zero bins, zero radius (the page draws a hollow marker). */
export function circleRadius(count: number, maxCount: number, maxRadius: number): number {
  if (count < 0 || maxCount < 0 || maxRadius < 0) throw new RangeError('Counts and radius cannot be negative');
  if (count === 0 || maxCount === 0) return 0;
  return maxRadius * Math.sqrt(Math.min(count, maxCount) / maxCount);
}

export type LabelSide = 'right' | 'left' | 'above' | 'below' | 'above-right' | 'below-right' | 'above-left' | 'below-left';

export interface LabelMark extends XY {
  radius: number;
  text: string;
}

export interface PlacedLabel {
  /** Anchor point of the text (baseline), with the SVG text-anchor to use. */
  x: number;
  y: number;
  anchor: 'start' | 'end' | 'middle';
  side: LabelSide;
  box: Box;
}

interface Box {
  left: number;
  top: number;
  right: number;
  bottom: number;
}

const SIDES: readonly LabelSide[] = ['right', 'left', 'above', 'below', 'above-right', 'below-right', 'above-left', 'below-left'];

function boxFor(mark: LabelMark, side: LabelSide, charWidth: number, lineHeight: number, gap: number): PlacedLabel {
  const w = mark.text.length * charWidth;
  const r = Math.max(mark.radius, 3) + gap;
  const baselineDrop = lineHeight * 0.35; // puts the middle of the text on the point's height
  switch (side) {
    case 'right':
      return {
        x: mark.x + r,
        y: mark.y + baselineDrop,
        anchor: 'start',
        side,
        box: { left: mark.x + r, right: mark.x + r + w, top: mark.y - lineHeight / 2, bottom: mark.y + lineHeight / 2 },
      };
    case 'left':
      return {
        x: mark.x - r,
        y: mark.y + baselineDrop,
        anchor: 'end',
        side,
        box: { left: mark.x - r - w, right: mark.x - r, top: mark.y - lineHeight / 2, bottom: mark.y + lineHeight / 2 },
      };
    case 'above':
      return {
        x: mark.x,
        y: mark.y - r - lineHeight * 0.25,
        anchor: 'middle',
        side,
        box: { left: mark.x - w / 2, right: mark.x + w / 2, top: mark.y - r - lineHeight, bottom: mark.y - r },
      };
    case 'below':
      return {
        x: mark.x,
        y: mark.y + r + lineHeight * 0.8,
        anchor: 'middle',
        side,
        box: { left: mark.x - w / 2, right: mark.x + w / 2, top: mark.y + r, bottom: mark.y + r + lineHeight },
      };
    default: {
      // Diagonals: the label's near corner touches the circle at 45°.
      const d = r * Math.SQRT1_2;
      const east = side.endsWith('right');
      const north = side.startsWith('above');
      const left = east ? mark.x + d : mark.x - d - w;
      const top = north ? mark.y - d - lineHeight : mark.y + d;
      return { x: east ? left : left + w, y: top + lineHeight * 0.8, anchor: east ? 'start' : 'end', side, box: { left, right: left + w, top, bottom: top + lineHeight } };
    }
  }
}

function overlaps(a: Box, b: Box): boolean {
  return a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
}

function overlapArea(a: Box, b: Box): number {
  const w = Math.min(a.right, b.right) - Math.max(a.left, b.left);
  const h = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
  return w > 0 && h > 0 ? w * h : 0;
}

function outside(box: Box, frame: Frame): number {
  return Math.max(0, -box.left) + Math.max(0, box.right - frame.width) + Math.max(0, -box.top) + Math.max(0, box.bottom - frame.height);
}

/**
 * Greedy placement, biggest circles first: each label takes the first side (right, left, above, below, then
 * the diagonals) that
 * stays inside the frame and clear of labels placed before it and of every circle; when none is clear it takes
 * the side with the least overlap. Returned in the order of `marks`.
 */
export function placeLabels(marks: readonly LabelMark[], frame: Frame, charWidth = 7, lineHeight = 14, gap = 3): PlacedLabel[] {
  const order = marks.map((_, i) => i).sort((a, b) => marks[b]!.radius - marks[a]!.radius || a - b);
  const circles: Box[] = marks.map((m) => ({ left: m.x - m.radius, right: m.x + m.radius, top: m.y - m.radius, bottom: m.y + m.radius }));
  const placed: Box[] = [];
  const result: PlacedLabel[] = new Array(marks.length);
  for (const i of order) {
    const mark = marks[i]!;
    let best: PlacedLabel | null = null;
    let bestCost = Infinity;
    for (const side of SIDES) {
      const candidate = boxFor(mark, side, charWidth, lineHeight, gap);
      const others = circles.filter((_, j) => j !== i);
      const cost =
        outside(candidate.box, frame) * 1000 +
        placed.reduce((sum, b) => sum + overlapArea(candidate.box, b), 0) +
        others.reduce((sum, b) => sum + overlapArea(candidate.box, b), 0);
      if (cost === 0 && !placed.some((b) => overlaps(candidate.box, b))) {
        best = candidate;
        break;
      }
      if (cost < bestCost) {
        best = candidate;
        bestCost = cost;
      }
    }
    result[i] = best!;
    placed.push(best!.box);
  }
  return result;
}
