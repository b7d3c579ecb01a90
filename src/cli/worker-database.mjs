// The database of one parallel test worker: worker 1 (or no worker id) keeps the given URL, worker N gets the
// same URL with `_N` after the database name. Node built-ins only: the test runner uses it before dependencies
// may exist, to make those databases.

/** @param {string | undefined} url @param {string | undefined} poolId @returns {string | undefined} */
export function workerDatabaseUrl(url, poolId) {
  const n = Number(poolId ?? 1);
  if (!url || !Number.isInteger(n) || n <= 1) return url;
  const u = new URL(url);
  u.pathname = `${u.pathname.replace(/\/$/, '')}_${n}`;
  return u.toString();
}

/** @param {string} name @param {number} worker */
export function workerDatabaseName(name, worker) {
  return worker <= 1 ? name : `${name}_${worker}`;
}
