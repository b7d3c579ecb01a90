// Human words for what a scan carried (its payload), for timelines and notes.
const CHECK_WORDS: Record<string, string> = {
  panelsAndLocks: 'panels and locks',
  floorAndWalls: 'floor and inner walls',
  dischargePort: 'discharge port and valve seat',
  lidAndSealHoles: 'lid and seal holes',
  labelLegible: 'label legible',
};

export function describePayload(p: Record<string, unknown>): string[] {
  const out: string[] = [];
  if (p.prepResult) out.push(p.prepResult === 'pass' ? 'Prep check passed' : 'Prep check failed');
  if (p.checklist && typeof p.checklist === 'object') {
    const failed = Object.entries(p.checklist as Record<string, boolean>)
      .filter(([, ok]) => !ok)
      .map(([k]) => CHECK_WORDS[k] ?? k);
    if (failed.length) out.push(`Faults: ${failed.join(', ')}`);
  }
  if (typeof p.faults === 'string' && p.faults) out.push(`Noted: ${p.faults}`);
  if (typeof p.lotNumber === 'string') out.push(`Liner lot ${p.lotNumber}`);
  if (typeof p.orderRef === 'string') out.push(`Hire order ${p.orderRef}`);
  if (p.purpose === 'transfer') out.push('Transfer of empties between depots');
  const fill = p.fill as { product?: string; volumeL?: number; massKg?: number; temperatureC?: number; seals?: string[] } | undefined;
  if (fill) {
    const q = [
      fill.volumeL != null ? `${fill.volumeL} L` : null,
      fill.massKg != null ? `${fill.massKg} kg` : null,
      fill.temperatureC != null ? `${fill.temperatureC} °C` : null,
    ].filter(Boolean);
    out.push(`Filled: ${fill.product ?? ''}${q.length ? ` (${q.join(', ')})` : ''}`);
    if (fill.seals?.length) out.push(`Seals applied: ${fill.seals.join(', ')}`);
  }
  if (Array.isArray(p.sealsVerified) && p.sealsVerified.length) out.push(`Seals checked: ${(p.sealsVerified as string[]).join(', ')}`);
  if (Array.isArray(p.flags) && (p.flags as string[]).includes('seal_mismatch')) out.push('Seal numbers did not match those applied');
  if (typeof p.note === 'string' && p.note) out.push(`Note: ${p.note}`);
  if (Array.isArray(p.photoIds) && p.photoIds.length) out.push(`${p.photoIds.length} photo${p.photoIds.length > 1 ? 's' : ''}`);
  return out;
}
