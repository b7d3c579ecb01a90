import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { sequelize } from '@/db/sequelize';

// Counters live in PostgreSQL (table rate_limits, created by a migration) so
// every app server behind a load balancer shares them.
function limiter(keyPrefix: string, points: number, durationSec: number, blockDurationSec = 0) {
  return new RateLimiterPostgres({
    storeClient: sequelize,
    storeType: 'sequelize',
    tableName: 'rate_limits',
    tableCreated: true,
    keyPrefix,
    points,
    duration: durationSec,
    blockDuration: blockDurationSec,
  });
}

const cache = new Map<string, RateLimiterPostgres>();
function get(name: string, make: () => RateLimiterPostgres) {
  let l = cache.get(name);
  if (!l) cache.set(name, (l = make()));
  return l;
}

/** Failed sign-ins: 5 per account and 20 per address in 15 minutes, then a 15-minute lock. */
export const signInLimits = {
  account: () => get('signin-account', () => limiter('signin_acct', 5, 15 * 60, 15 * 60)),
  address: () => get('signin-address', () => limiter('signin_ip', 20, 15 * 60, 15 * 60)),
};

/** Public forms on the Digital Link page: 5 reports per address per hour. */
export const publicFormLimit = () => get('public-form', () => limiter('public_form', 5, 60 * 60));

/**
 * Public reports about one bin: 10 a day from all addresses together. A bin
 * gets a report or two a day in real use; this stops one label (photographed
 * and passed round) from flooding the planners' inbox from many addresses.
 */
export const publicBinFormLimit = () => get('public-bin-form', () => limiter('public_bin', 10, 24 * 60 * 60));

/**
 * "Forgotten password" requests: 10 per address in 15 minutes (answered with a
 * 429), and at most 3 links per e-mail address an hour (further requests get
 * the usual answer but no mail, so nobody can flood someone's inbox).
 */
export const passwordResetLimits = {
  address: () => get('reset-address', () => limiter('reset_ip', 10, 15 * 60)),
  account: () => get('reset-account', () => limiter('reset_acct', 3, 60 * 60)),
};

/** Seconds until the key may try again, or 0 when it is not blocked. */
export async function secondsBlocked(l: RateLimiterPostgres, key: string): Promise<number> {
  const res = await l.get(key);
  if (res && res.consumedPoints > l.points) return Math.ceil(res.msBeforeNext / 1000);
  return 0;
}

/** Counts one hit; returns the seconds to wait when the limit is exceeded, else 0. */
export async function hit(l: RateLimiterPostgres, key: string): Promise<number> {
  try {
    await l.consume(key);
    return 0;
  } catch (e) {
    if (e instanceof RateLimiterRes) return Math.max(1, Math.ceil(e.msBeforeNext / 1000));
    throw e;
  }
}
