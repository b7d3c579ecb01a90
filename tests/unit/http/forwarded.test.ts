// The client-address and HSTS rules of src/lib/http/forwarded.ts, as literal tables.
// Addresses are documentation ranges (RFC 5737: 192.0.2.0/24, 198.51.100.0/24,
// 203.0.113.0/24; RFC 3849: 2001:db8::/32). The hop counting follows MDN's
// X-Forwarded-For page ("use the rightmost IP address ... of trusted proxies",
// leftmost entries are client-supplied) and Express's numeric "trust proxy".
import { describe, test, expect } from 'vitest';
import { arrivedOverHttps, clientAddressFrom, HSTS_VALUE, hstsHeader, normaliseAddress, trustedHops } from '@/lib/http/forwarded';

describe('TRUST_PROXY', () => {
  test.each([
    [undefined, 0],
    ['', 0],
    ['0', 0],
    ['false', 0],
    ['true', 0],
    ['-1', 0],
    ['1.5', 0],
    ['abc', 0],
    ['1', 1],
    ['2', 2],
    [' 3 ', 3],
    ['10', 10],
  ] as const)('%j → %i trusted hops', (value, hops) => {
    expect(trustedHops(value)).toBe(hops);
  });
});

describe('addresses are normalised', () => {
  test.each([
    ['203.0.113.7', '203.0.113.7'],
    ['::ffff:127.0.0.1', '127.0.0.1'],
    ['203.0.113.7:51234', '203.0.113.7'],
    ['[2001:db8::1]:443', '2001:db8::1'],
    ['2001:DB8::A', '2001:db8::a'],
    ['::1', '::1'],
    ['unknown', null],
    ['203.0.113.256', null],
    ['<script>', null],
    ['', null],
  ] as const)('%j → %j', (raw, out) => {
    expect(normaliseAddress(raw)).toBe(out);
  });
});

describe('the client address', () => {
  // [socket, X-Forwarded-For, TRUST_PROXY hops, client]
  test.each([
    // No proxy trusted: the socket is the client, whatever the header says (the forged header).
    ['198.51.100.20', '203.0.113.1', 0, '198.51.100.20'],
    ['198.51.100.20', '203.0.113.1, 203.0.113.2', 0, '198.51.100.20'],
    ['::ffff:198.51.100.20', null, 0, '198.51.100.20'],
    [undefined, '203.0.113.1', 0, 'unknown'],
    // One proxy: its appended entry (the rightmost) is the client; a forged leftmost entry is ignored.
    ['10.0.0.2', '192.0.2.44', 1, '192.0.2.44'],
    ['10.0.0.2', '203.0.113.9, 192.0.2.44', 1, '192.0.2.44'],
    ['10.0.0.2', '203.0.113.9,203.0.113.10 , 192.0.2.44', 1, '192.0.2.44'],
    // Two proxies: the second entry from the right.
    ['10.0.0.2', '203.0.113.9, 192.0.2.44, 10.0.0.1', 2, '192.0.2.44'],
    ['10.0.0.2', '192.0.2.44, 10.0.0.1', 2, '192.0.2.44'],
    // Fewer entries than trusted hops: the furthest address any proxy saw.
    ['10.0.0.2', '192.0.2.44', 3, '192.0.2.44'],
    // A trusted proxy that sent no header, or wrote something that is no address: the socket.
    ['10.0.0.2', null, 1, '10.0.0.2'],
    ['10.0.0.2', '', 1, '10.0.0.2'],
    ['10.0.0.2', '203.0.113.9, unknown', 1, '10.0.0.2'],
    // IPv6 and ports as proxies write them.
    ['10.0.0.2', '203.0.113.9, [2001:db8::5]:4711', 1, '2001:db8::5'],
  ] as const)('socket %j, X-Forwarded-For %j, %i hops → %j', (socketAddress, forwardedFor, hops, client) => {
    expect(clientAddressFrom({ socketAddress, forwardedFor, hops })).toBe(client);
  });
});

describe('HTTPS and HSTS', () => {
  // [our socket is TLS, certificate source, X-Forwarded-Proto, hops, over HTTPS, HSTS sent]
  test.each([
    [true, 'operator', null, 0, true, true],
    [true, 'local-ca', null, 0, true, false], // phones must still click through and fetch the CA over HTTP
    [false, null, null, 0, false, false],
    [false, null, 'https', 0, false, false], // a client's own X-Forwarded-Proto counts for nothing
    [false, null, 'https', 1, true, true], // a trusted proxy terminated TLS
    [false, null, 'http', 1, false, false],
    [false, null, 'HTTPS', 1, true, true],
    [false, null, 'https, http', 1, false, false], // the trusted proxy's own entry is the rightmost
    [false, null, 'http, https', 1, true, true],
    [false, null, 'https, http', 2, true, true], // the outermost of two trusted proxies saw HTTPS
    [false, null, null, 1, false, false],
  ] as const)('TLS %j (%j), X-Forwarded-Proto %j, %i hops → https %j, HSTS %j', (encrypted, tls, forwardedProto, hops, https, hsts) => {
    expect(arrivedOverHttps({ encrypted, forwardedProto, hops })).toBe(https);
    // RFC 6797 §7.2: never over plain HTTP; §6.1.1: max-age in seconds (two years here).
    expect(hstsHeader({ encrypted, forwardedProto, hops, tls })).toBe(hsts ? HSTS_VALUE : null);
  });
  test('the value is two years in seconds', () => {
    expect(HSTS_VALUE).toBe(`max-age=${2 * 365 * 24 * 3600}`);
  });
});
