// The middleware writes the caller's address into this header on every request
// (overwriting anything the caller sent), because @auth/core hands `authorize`
// a copy of the request without the socket address.
export const CLIENT_IP_HEADER = 'x-loopfold-client-ip';

/** Behind a proxy you trust, set TRUST_PROXY=1 to take the first X-Forwarded-For hop. */
export function clientAddress(request: Request, socketAddress: string | undefined): string {
  if (process.env.TRUST_PROXY === '1') {
    const fwd = request.headers.get('x-forwarded-for');
    if (fwd) return fwd.split(',')[0]!.trim();
  }
  return socketAddress ?? 'unknown';
}
