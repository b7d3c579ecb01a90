// Who is on the other end of a request, and did it arrive over TLS? Pure: the
// app server (src/cli/serve.mjs) hands the socket's address and whether the
// socket is encrypted to the app through `locals.connection`; these rules turn
// that, the X-Forwarded-* headers and TRUST_PROXY into the client address used
// by rate limits, audit rows and requester_ip, and into the HSTS decision.
//
// The rule (README, "Behind a reverse proxy"):
// - TRUST_PROXY unset or 0: the socket's address is the client; X-Forwarded-*
//   headers are the client's own words and count for nothing.
// - TRUST_PROXY=N: N proxies of ours stand in front of the app. The socket is
//   the nearest; each appends the address it saw to X-Forwarded-For, so the
//   client is the N-th entry counted from the right. Entries further left were
//   written by the client and are never used. With fewer entries than N, the
//   leftmost one is the furthest address any proxy saw.
//   (Same hop counting as Express's "trust proxy" with a number; common practice.)

/** TRUST_PROXY as a number of trusted proxy hops (0 for unset, "0", "false" or anything that is not a whole number). */
export function trustedHops(value: string | undefined): number {
  const v = (value ?? '').trim();
  if (!/^\d{1,2}$/.test(v)) return 0;
  return Number(v);
}

const IPV4 = /^(25[0-5]|2[0-4]\d|1\d\d|[1-9]?\d)(\.(25[0-5]|2[0-4]\d|1\d\d|[1-9]?\d)){3}$/;
const IPV6 = /^[0-9a-f:]{2,39}(%[0-9a-z]{1,16})?$/i;

/**
 * One address as written by a proxy or a socket, normalised: brackets and a
 * port taken off, an IPv4-mapped IPv6 address written as IPv4, or null when
 * it is not an IP address at all.
 */
export function normaliseAddress(raw: string | undefined | null): string | null {
  let a = (raw ?? '').trim();
  if (!a) return null;
  const bracketed = /^\[([^\]]+)\](?::\d{1,5})?$/.exec(a);
  if (bracketed) a = bracketed[1]!;
  else if (/^[\d.]+:\d{1,5}$/.test(a)) a = a.slice(0, a.lastIndexOf(':'));
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(a);
  if (mapped) a = mapped[1]!;
  if (IPV4.test(a)) return a;
  if (a.includes(':') && IPV6.test(a)) return a.toLowerCase();
  return null;
}

/** The comma-separated entries of one or more X-Forwarded-* header values, in order, trimmed. */
function headerList(value: string | null | undefined): string[] {
  return (value ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
}

export interface AddressInput {
  /** The TCP peer: the client itself, or the nearest proxy. */
  socketAddress: string | null | undefined;
  /** The X-Forwarded-For header as received (several headers joined with commas). */
  forwardedFor: string | null | undefined;
  /** trustedHops(TRUST_PROXY). */
  hops: number;
}

/** The client's address by the rule above; 'unknown' when not even the socket's address is known. */
export function clientAddressFrom({ socketAddress, forwardedFor, hops }: AddressInput): string {
  const socket = normaliseAddress(socketAddress) ?? 'unknown';
  if (hops <= 0) return socket;
  const list = headerList(forwardedFor);
  if (list.length === 0) return socket;
  const entry = list[Math.max(0, list.length - hops)]!;
  // A trusted proxy writes a real address; anything else means the chain is not what TRUST_PROXY says.
  return normaliseAddress(entry) ?? socket;
}

export interface TransportInput {
  /** The socket itself is TLS (this server holds the certificate). */
  encrypted: boolean;
  /** The X-Forwarded-Proto header as received. */
  forwardedProto: string | null | undefined;
  hops: number;
}

/**
 * Whether the client reached us over HTTPS: our own TLS socket, or — only with
 * trusted proxies — the X-Forwarded-Proto entry written by the outermost
 * trusted proxy (the N-th from the right, counted as for X-Forwarded-For).
 */
export function arrivedOverHttps({ encrypted, forwardedProto, hops }: TransportInput): boolean {
  if (encrypted) return true;
  if (hops <= 0) return false;
  const list = headerList(forwardedProto);
  if (list.length === 0) return false;
  return list[Math.max(0, list.length - hops)]!.toLowerCase() === 'https';
}

/** Where the server's certificate came from: the operator's own, Loopfold's locally made CA, or none (plain HTTP). */
export type TlsSource = 'operator' | 'local-ca' | null;

/** Two years, with subdomains left alone (the operator's other hosts are not ours to pin); the value hstspreload.org asks for, from memory. */
export const HSTS_VALUE = 'max-age=63072000';

/**
 * Strict-Transport-Security, or null when it must not be sent:
 * - our socket is TLS with the operator's own certificate → send;
 * - our socket is TLS with the locally made CA → never (phones must still
 *   reach the plain-HTTP page that hands out that CA, and click through while
 *   they do not trust it yet);
 * - plain HTTP behind trusted proxies that say the client used HTTPS → send;
 * - anything else → never (RFC 6797 §7.2: not over plain HTTP).
 */
export function hstsHeader(input: TransportInput & { tls: TlsSource }): string | null {
  if (input.encrypted) return input.tls === 'operator' ? HSTS_VALUE : null;
  return arrivedOverHttps(input) ? HSTS_VALUE : null;
}
