/**
 * How many bins one trailer takes: floor positions for the bin's footprint,
 * stack levels from the bin's height (folded or erected) and the trailer's
 * inside height, for filled bins the stacking limit read from the UN mark, and
 * the trailer's payload. Pure: no I/O, no clock.
 *
 * Sources:
 * - UN Model Regulations 6.5.6.6.4 (stacking test load = 1.8 × combined maximum
 *   gross mass of the IBCs that may stand on top) and 6.5.2.1.1 (the mark
 *   carries the stacking test load, 0 = not for stacking), read by
 *   `@/lib/un-marking`.
 * - Trailer size and floor counts: common practice (REFERENCES §9), no single
 *   source.
 */
import { parseUnMarking } from '@/lib/bins/un-marking';

/** Inside dimensions and payload of a trailer (admin data). */
export interface Trailer {
  name?: string;
  insideLengthMm: number;
  insideWidthMm: number;
  insideHeightMm: number;
  payloadKg: number;
}

/**
 * A standard semi-trailer, about 13.6 × 2.45 × 2.7 m inside, payload about
 * 24 t: common practice (REFERENCES §9), used as a default until admins enter
 * their own trailers.
 */
export const STANDARD_TRAILER: Readonly<Trailer> = {
  name: 'Standard semi-trailer (common practice)',
  insideLengthMm: 13_600,
  insideWidthMm: 2_450,
  insideHeightMm: 2_700,
  payloadKg: 24_000,
};

/**
 * Play allowed per bin in each floor direction, so bins can be set down with a
 * forklift and nominal sizes that run a little over still fit. 10 mm is our
 * choice (common practice has "some play", no figure); with it the practice
 * counts of §9 come out (26 of 1200 × 1000, 33 of 1200 × 800).
 */
const DEFAULT_FLOOR_PLAY_MM = 10;

/**
 * Head room kept above the top bin so the forks can lift it over the one
 * below: 50 mm is our choice, not a sourced figure.
 */
const DEFAULT_HEAD_ROOM_MM = 50;

export interface Footprint {
  lengthMm: number;
  widthMm: number;
}

/** A row across the trailer: bins side by side, each turned one way. */
export interface FloorRow {
  /** 'along': the bin's length runs along the trailer; 'across': it runs across. */
  orientation: 'along' | 'across';
  binsAcross: number;
  /** Trailer length the row takes, play included. */
  rowLengthMm: number;
}

export interface FloorPlan {
  positions: number;
  /** Rows with the bin's length along the trailer, and with it across. */
  rowsAlong: number;
  rowsAcross: number;
  binsPerRowAlong: number;
  binsPerRowAcross: number;
  /** Trailer length used by the rows, play included. */
  usedLengthMm: number;
  /** Positions each single orientation gives on its own, for comparison. */
  allAlong: number;
  allAcross: number;
}

function row(orientation: 'along' | 'across', footprint: Footprint, trailer: Trailer, play: number): FloorRow {
  const lengthwise = orientation === 'along' ? footprint.lengthMm : footprint.widthMm;
  const crosswise = orientation === 'along' ? footprint.widthMm : footprint.lengthMm;
  return {
    orientation,
    binsAcross: Math.floor(trailer.insideWidthMm / (crosswise + play)),
    rowLengthMm: lengthwise + play,
  };
}

/**
 * Floor positions for a footprint: rows across the trailer, each row with all
 * its bins turned the same way, rows of both kinds mixed along the length
 * where that gives more (every split is tried). Ties keep the fewer turned
 * rows (the simpler load).
 */
export function floorPositions(trailer: Trailer, footprint: Footprint, playMm = DEFAULT_FLOOR_PLAY_MM): FloorPlan {
  const along = row('along', footprint, trailer, playMm);
  const across = row('across', footprint, trailer, playMm);
  const maxAlongRows = along.binsAcross > 0 ? Math.floor(trailer.insideLengthMm / along.rowLengthMm) : 0;
  const maxAcrossRows = across.binsAcross > 0 ? Math.floor(trailer.insideLengthMm / across.rowLengthMm) : 0;
  const plan = (rowsAlong: number, rowsAcross: number): FloorPlan => ({
    positions: rowsAlong * along.binsAcross + rowsAcross * across.binsAcross,
    rowsAlong,
    rowsAcross,
    binsPerRowAlong: along.binsAcross,
    binsPerRowAcross: across.binsAcross,
    usedLengthMm: rowsAlong * along.rowLengthMm + rowsAcross * across.rowLengthMm,
    allAlong: maxAlongRows * along.binsAcross,
    allAcross: maxAcrossRows * across.binsAcross,
  });
  // Start from all rows turned "across" and trade them for "along" rows one at a time.
  let best = plan(0, maxAcrossRows);
  for (let rowsAlong = 1; rowsAlong <= maxAlongRows; rowsAlong += 1) {
    const left = trailer.insideLengthMm - rowsAlong * along.rowLengthMm;
    const rowsAcross = across.binsAcross > 0 ? Math.floor(left / across.rowLengthMm) : 0;
    const candidate = plan(rowsAlong, rowsAcross);
    const turned = (p: FloorPlan) => Math.min(p.rowsAlong, p.rowsAcross);
    if (candidate.positions > best.positions || (candidate.positions === best.positions && turned(candidate) < turned(best))) {
      best = candidate;
    }
  }
  return best;
}

/** Bins one above the other that fit under the roof with head room kept. */
export function stackLevelsByHeight(insideHeightMm: number, binHeightMm: number, headRoomMm = DEFAULT_HEAD_ROOM_MM): number {
  if (binHeightMm <= 0) return 0;
  return Math.max(0, Math.floor((insideHeightMm - headRoomMm) / binHeightMm));
}

/**
 * How many filled bins of a given gross mass may stand on one: the mark's
 * stacking test load is 1.8 × the combined maximum gross mass of the bins on
 * top (UN Model Regulations 6.5.6.6.4), so the bins on top may weigh at most
 * load / 1.8 together. Worked in integer tenths of a kilogram to stay exact.
 */
export function binsAllowedOnTop(stackingTestLoadKg: number, grossKgPerBin: number): number {
  if (stackingTestLoadKg <= 0 || grossKgPerBin <= 0) return 0;
  const loadTenths = Math.round(stackingTestLoadKg * 10);
  const grossTenths = Math.round(grossKgPerBin * 10);
  return Math.floor((loadTenths * 10) / (grossTenths * 18));
}

export interface BinForLoading {
  footprint: Footprint;
  heightErectedMm: number;
  heightFoldedMm: number;
  tareKg: number;
  maxGrossKg: number;
  /** The primary UN mark, needed to stack filled bins; without it filled bins are not stacked. */
  unMarking?: string | null;
}

export type LoadKind =
  | { kind: 'folded' }
  | { kind: 'erected-empty' }
  /** grossKgPerBin: tare + contents of one filled bin (at most the bin's maximum gross mass). */
  | { kind: 'filled'; grossKgPerBin: number };

/**
 * How a load of empties travels (our rule): bins on hire leave lined, so erected; transfers of empties between
 * depots go folded.
 */
export const LOAD_KIND_BY_PURPOSE: Readonly<Record<'hire' | 'transfer', LoadKind>> = {
  hire: { kind: 'erected-empty' },
  transfer: { kind: 'folded' },
};

export interface LoadPlanOptions {
  floorPlayMm?: number;
  headRoomMm?: number;
  /** A site's or maker's limit on levels (e.g. folded bins at most 4 high); none by default. */
  maxLevels?: number;
}

export type LimitingFactor = 'space' | 'stacking-test-load' | 'level-limit' | 'payload';

export interface LoadCapacity {
  ok: true;
  bins: number;
  limitedBy: LimitingFactor;
  /** One sentence naming what limits the load and the numbers behind it. */
  explanation: string;
  floor: FloorPlan;
  stackHeightMm: number;
  levelsByHeight: number;
  /** Filled loads only: levels the UN mark allows (1 + bins allowed on top). */
  levelsByStackingLoad?: number;
  levels: number;
  /** Bins by floor × levels, before the payload. */
  binsBySpace: number;
  /** Bins the payload carries. */
  binsByPayload: number;
  grossKgPerBin: number;
  loadMassKg: number;
}

export interface LoadPlanError {
  ok: false;
  message: string;
}

function positive(value: number): boolean {
  return Number.isFinite(value) && value > 0;
}

function checkInput(trailer: Trailer, bin: BinForLoading, load: LoadKind, opts: LoadPlanOptions): string | undefined {
  const dims: [string, number][] = [
    ['trailer inside length', trailer.insideLengthMm],
    ['trailer inside width', trailer.insideWidthMm],
    ['trailer inside height', trailer.insideHeightMm],
    ['trailer payload', trailer.payloadKg],
    ['bin length', bin.footprint.lengthMm],
    ['bin width', bin.footprint.widthMm],
    ['bin erected height', bin.heightErectedMm],
    ['bin folded height', bin.heightFoldedMm],
    ['bin tare', bin.tareKg],
    ['bin maximum gross mass', bin.maxGrossKg],
  ];
  const bad = dims.find(([, value]) => !positive(value));
  if (bad) return `The ${bad[0]} must be a number above 0 (got ${String(bad[1])})`;
  if (opts.maxLevels !== undefined && !(Number.isInteger(opts.maxLevels) && opts.maxLevels >= 1)) {
    return 'A level limit must be a whole number of at least 1';
  }
  if (load.kind === 'filled') {
    if (!positive(load.grossKgPerBin)) return 'The gross mass of a filled bin must be a number above 0 kg';
    if (load.grossKgPerBin < bin.tareKg) {
      return `A filled bin cannot weigh ${load.grossKgPerBin} kg, less than its tare of ${bin.tareKg} kg`;
    }
    if (load.grossKgPerBin > bin.maxGrossKg) {
      return `A filled bin of ${load.grossKgPerBin} kg is over the bin's maximum gross mass of ${bin.maxGrossKg} kg: it may not be loaded`;
    }
  }
  return undefined;
}

/** Stack levels a filled load may have by the mark; with no usable mark, one level. */
function filledLevels(bin: BinForLoading, grossKgPerBin: number): { levels: number; why: string } {
  if (!bin.unMarking) return { levels: 1, why: 'the bin has no UN mark to show a stacking test load, so filled bins are not stacked' };
  const parsed = parseUnMarking(bin.unMarking);
  if (!parsed.ok) return { levels: 1, why: `the bin's UN mark cannot be read (${parsed.error.message}), so filled bins are not stacked` };
  const { stackingTestLoadKg } = parsed.marking;
  if (stackingTestLoadKg === 0) return { levels: 1, why: 'the UN mark gives a stacking test load of 0 kg: not designed for stacking' };
  const onTop = binsAllowedOnTop(stackingTestLoadKg, grossKgPerBin);
  return {
    levels: 1 + onTop,
    why: `the UN mark's stacking test load of ${stackingTestLoadKg} kg allows ${onTop} bin${onTop === 1 ? '' : 's'} of ${grossKgPerBin} kg on top (test load = 1.8 × mass on top, UN 6.5.6.6.4)`,
  };
}

/**
 * The capacity of one trailer for one bin type and kind of load, with the
 * factor that limits it. Folded and erected empties are limited by floor and
 * height (payload checked with the tare); filled loads also by the mark's
 * stacking test load and by the payload.
 */
export function loadCapacity(trailer: Trailer, bin: BinForLoading, load: LoadKind, opts: LoadPlanOptions = {}): LoadCapacity | LoadPlanError {
  const problem = checkInput(trailer, bin, load, opts);
  if (problem) return { ok: false, message: problem };

  const floor = floorPositions(trailer, bin.footprint, opts.floorPlayMm ?? DEFAULT_FLOOR_PLAY_MM);
  const stackHeightMm = load.kind === 'folded' ? bin.heightFoldedMm : bin.heightErectedMm;
  const levelsByHeight = stackLevelsByHeight(trailer.insideHeightMm, stackHeightMm, opts.headRoomMm ?? DEFAULT_HEAD_ROOM_MM);
  const grossKgPerBin = load.kind === 'filled' ? load.grossKgPerBin : bin.tareKg;

  let levels = levelsByHeight;
  let limitedBy: LimitingFactor = 'space';
  let why = `${floor.positions} floor positions × ${levelsByHeight} level${levelsByHeight === 1 ? '' : 's'} of ${stackHeightMm} mm under ${trailer.insideHeightMm} mm`;
  let levelsByStackingLoad: number | undefined;
  if (load.kind === 'filled') {
    const byMark = filledLevels(bin, grossKgPerBin);
    levelsByStackingLoad = byMark.levels;
    if (byMark.levels < levels) {
      levels = byMark.levels;
      limitedBy = 'stacking-test-load';
      why = `${floor.positions} floor positions × ${levels} level${levels === 1 ? '' : 's'}: ${byMark.why}`;
    }
  }
  if (opts.maxLevels !== undefined && opts.maxLevels < levels) {
    levels = opts.maxLevels;
    limitedBy = 'level-limit';
    why = `${floor.positions} floor positions × ${levels} level${levels === 1 ? '' : 's'} (the level limit given)`;
  }
  const binsBySpace = floor.positions * levels;
  const binsByPayload = Math.floor(trailer.payloadKg / grossKgPerBin);
  let bins = binsBySpace;
  if (binsByPayload < binsBySpace) {
    bins = binsByPayload;
    limitedBy = 'payload';
    why = `payload ${trailer.payloadKg} kg ÷ ${grossKgPerBin} kg a bin = ${binsByPayload} bins (space would take ${binsBySpace})`;
  }
  const capacity: LoadCapacity = {
    ok: true,
    bins,
    limitedBy,
    explanation: `${bins} bins, limited by ${FACTOR_WORDS[limitedBy]}: ${why}.`,
    floor,
    stackHeightMm,
    levelsByHeight,
    levels,
    binsBySpace,
    binsByPayload,
    grossKgPerBin,
    loadMassKg: Math.round(bins * grossKgPerBin * 10) / 10,
  };
  if (levelsByStackingLoad !== undefined) capacity.levelsByStackingLoad = levelsByStackingLoad;
  return capacity;
}

const FACTOR_WORDS: Readonly<Record<LimitingFactor, string>> = {
  space: 'floor space and inside height',
  'stacking-test-load': 'the stacking test load on the UN mark',
  'level-limit': 'the level limit',
  payload: 'the payload',
};
