// How long the person who recorded a scan may undo it themselves. Pure: the
// server decides with it, the phone counts down with it.

export const UNDO_REASON = 'undone by the person who scanned it';

/** Whole seconds left to undo a scan recorded at `recordedAt`, 0 once the window has passed (or undo is off). */
export function undoSecondsLeft(recordedAt: Date | string, now: Date, windowSeconds: number): number {
  if (windowSeconds <= 0) return 0;
  const elapsedMs = now.getTime() - new Date(recordedAt).getTime();
  if (!Number.isFinite(elapsedMs) || elapsedMs < 0) return elapsedMs < 0 ? windowSeconds : 0;
  return Math.max(0, Math.ceil(windowSeconds - elapsedMs / 1000));
}

/** The confirmation kept in view after a scan: what was recorded and the bin's new status. */
export function recordedWords(actionLabel: string, statusLabel: string): string {
  return `${actionLabel} recorded. The bin is now ${statusLabel.toLowerCase()}.`;
}
