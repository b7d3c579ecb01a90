// The middleware writes the caller's address (src/lib/http/forwarded.ts) into
// this header on every request, overwriting anything the caller sent, because
// @auth/core hands `authorize` a copy of the request without our locals.
export const CLIENT_IP_HEADER = 'x-loopfold-client-ip';
