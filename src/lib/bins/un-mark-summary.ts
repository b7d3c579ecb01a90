// A UN IBC mark decoded into the lines a planner reads while typing it: what
// each field means, in words and units. Used by the register and edit forms
// (in the browser, as the mark is typed) and by the import preview.
//
// Pure: no I/O; the decoding itself is src/lib/bins/un-marking.ts.
import { parseUnMarking, type UnIbcMarking } from './un-marking';

export interface UnMarkField {
  key: 'typeCode' | 'packingGroup' | 'manufacture' | 'state' | 'manufacturer' | 'stackingLoad' | 'maxGross' | 'onTop';
  label: string;
  value: string;
}

export type UnMarkSummary = { ok: true; fields: UnMarkField[]; manufactureMonth: string; typeCode: string } | { ok: false; message: string };

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

function kg(value: number): string {
  return `${value.toLocaleString('en-GB')} kg`;
}

function onTop(m: UnIbcMarking): string {
  if (m.stackingTestLoadKg === 0) return 'None: not designed for stacking';
  const n = m.maxIbcsStackedOnTop;
  if (n === 0) return `None: the stacking load is below one bin of ${kg(m.maxGrossMassKg)}`;
  return `${n} bin${n === 1 ? '' : 's'} of up to ${kg(m.maxGrossMassKg)} each`;
}

function summariseUnMark(marking: UnIbcMarking): UnMarkField[] {
  const { typeCode, packingGroup, manufacture } = marking;
  return [
    { key: 'typeCode', label: 'Type code', value: `${typeCode.code}: ${typeCode.meaning}` },
    { key: 'packingGroup', label: 'Packing groups', value: `${packingGroup.letter}: ${packingGroup.meaning}` },
    { key: 'manufacture', label: 'Manufactured', value: `${MONTHS[manufacture.month - 1]} ${manufacture.year}` },
    { key: 'state', label: 'State of approval', value: marking.state },
    { key: 'manufacturer', label: 'Manufacturer', value: marking.manufacturer },
    { key: 'stackingLoad', label: 'Stacking test load', value: marking.stackingTestLoadKg === 0 ? '0 kg (not for stacking)' : kg(marking.stackingTestLoadKg) },
    { key: 'maxGross', label: 'Maximum gross mass', value: kg(marking.maxGrossMassKg) },
    { key: 'onTop', label: 'May stand on top', value: onTop(marking) },
  ];
}

/** Decodes a typed mark; a malformed one gives the parser's reason. */
export function decodeUnMark(text: string): UnMarkSummary {
  const result = parseUnMarking(text);
  if (!result.ok) return { ok: false, message: result.error.message };
  const { manufacture } = result.marking;
  return {
    ok: true,
    fields: summariseUnMark(result.marking),
    manufactureMonth: `${manufacture.year}-${String(manufacture.month).padStart(2, '0')}`,
    typeCode: result.marking.typeCode.code,
  };
}
