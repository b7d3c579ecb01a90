// The local certificate `HTTPS=1 npm start` makes for phones on the yard LAN, read back with Node's own
// X.509 parser (node:crypto X509Certificate, which src/cli/https.mjs does not use).
import { describe, test, expect, beforeAll } from 'vitest';
import { X509Certificate, createPrivateKey, createPublicKey } from 'node:crypto';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { certificateNames, ensureLocalCertificate, lanAddresses, SERVER_CERT_DAYS } from '@/cli/https.mjs';

const DAY = 86_400_000;

describe('which names the certificate covers', () => {
  test('LAN IPv4 addresses only: no loopback, no link-local, no IPv6, no duplicates', () => {
    const ifaces = {
      lo: [{ address: '127.0.0.1', family: 'IPv4', internal: true }],
      eth0: [
        { address: '192.168.1.20', family: 'IPv4', internal: false },
        { address: 'fe80::1', family: 'IPv6', internal: false },
      ],
      wlan0: [
        { address: '10.0.0.7', family: 'IPv4', internal: false },
        { address: '169.254.3.4', family: 'IPv4', internal: false },
      ],
      eth1: [{ address: '192.168.1.20', family: 'IPv4', internal: false }],
    };
    expect(lanAddresses(ifaces as never)).toEqual(['10.0.0.7', '192.168.1.20']);
  });
  test('localhost, the machine’s name (also as .local), loopback and the LAN addresses', () => {
    expect(certificateNames({ host: 'Yard-PC', addresses: ['192.168.1.20'] })).toEqual({
      dns: ['localhost', 'yard-pc', 'yard-pc.local'],
      ips: ['127.0.0.1', '::1', '192.168.1.20'],
    });
  });
});

describe('the local CA and the server certificate', () => {
  const dir = mkdtempSync(join(tmpdir(), 'loopfold-tls-'));
  const names = certificateNames({ host: 'yard-pc', addresses: ['192.168.1.20'] });
  const now = new Date('2026-12-01T08:00:00Z');
  let first: Awaited<ReturnType<typeof ensureLocalCertificate>>;
  let ca: X509Certificate;
  let server: X509Certificate;

  beforeAll(async () => {
    first = await ensureLocalCertificate(dir, names, now);
    ca = new X509Certificate(readFileSync(first.caPath));
    server = new X509Certificate(readFileSync(first.certPath));
  }, 60_000);

  test('the CA is a CA (phones install it as one) and signs the server certificate', () => {
    expect(first.made).toBe(true);
    expect(ca.ca).toBe(true);
    expect(server.ca).toBe(false);
    expect(server.checkIssued(ca)).toBe(true);
    expect(server.verify(ca.publicKey)).toBe(true);
  });

  test('the server certificate covers every name and address, and serves TLS servers only', () => {
    expect(server.checkHost('localhost')).toBe('localhost');
    expect(server.checkHost('yard-pc.local')).toBe('yard-pc.local');
    expect(server.checkIP('127.0.0.1')).toBe('127.0.0.1');
    expect(server.checkIP('192.168.1.20')).toBe('192.168.1.20');
    expect(server.checkIP('192.168.1.21')).toBeUndefined();
    expect(server.keyUsage).toContain('1.3.6.1.5.5.7.3.1'); // id-kp-serverAuth (RFC 5280 §4.2.1.12)
  });

  test('validity stays inside what Apple platforms accept for TLS server certificates (398 days, from memory)', () => {
    const days = (Date.parse(server.validTo) - Date.parse(server.validFrom)) / DAY;
    expect(days).toBeLessThanOrEqual(398);
    expect(Date.parse(server.validTo) - now.getTime()).toBeCloseTo(SERVER_CERT_DAYS * DAY, -5);
  });

  test('the key belongs to the certificate', () => {
    const pub = createPublicKey(createPrivateKey(readFileSync(first.keyPath))).export({ type: 'spki', format: 'der' });
    expect(Buffer.compare(pub, server.publicKey.export({ type: 'spki', format: 'der' }))).toBe(0);
  });

  test('kept while the names hold and expiry is far; renewed (same CA) when an address changes or expiry nears', async () => {
    const again = await ensureLocalCertificate(dir, names, new Date(now.getTime() + 100 * DAY));
    expect(again.made).toBe(false);
    const moved = await ensureLocalCertificate(dir, certificateNames({ host: 'yard-pc', addresses: ['192.168.1.33'] }), now);
    expect(moved.made).toBe(true);
    const renewed = new X509Certificate(readFileSync(moved.certPath));
    expect(renewed.checkIP('192.168.1.33')).toBe('192.168.1.33');
    expect(new X509Certificate(readFileSync(moved.caPath)).fingerprint256).toBe(ca.fingerprint256);
    expect(renewed.checkIssued(ca)).toBe(true);
    const late = await ensureLocalCertificate(dir, certificateNames({ host: 'yard-pc', addresses: ['192.168.1.33'] }), new Date(now.getTime() + (SERVER_CERT_DAYS - 10) * DAY));
    expect(late.made).toBe(true);
  }, 60_000);
});
