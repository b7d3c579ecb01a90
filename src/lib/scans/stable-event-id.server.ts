import { createHash } from 'node:crypto';

/**
 * A client event id derived from what the event is about (e.g. "this load's
 * delivery of this bin"), shaped as a v4 UUID: recording the same thing twice
 * replays the first answer instead of recording it again.
 */
export function stableEventId(seed: string): string {
  const h = createHash('sha256').update(seed).digest('hex');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-8${h.slice(17, 20)}-${h.slice(20, 32)}`;
}
