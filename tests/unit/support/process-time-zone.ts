/**
 * date-fns works in the process's own time zone. To use it as an independent second opinion on zoned day
 * counts, the tests run it with TZ set to the zone under test, and put the old value back afterwards.
 * (Node re-reads TZ whenever process.env.TZ is assigned.)
 */
export function inProcessTimeZone<T>(timeZone: string, work: () => T): T {
  const previous = process.env.TZ;
  process.env.TZ = timeZone;
  try {
    return work();
  } finally {
    if (previous === undefined) delete process.env.TZ;
    else process.env.TZ = previous;
  }
}
