/**
 * The app's own address for links that leave it (mail): from configuration,
 * never from a request's Host header, so a forged Host cannot poison a link.
 */
export function appUrl(): string {
  return (process.env.APP_URL ?? `http://localhost:${process.env.PORT ?? 4321}`).replace(/\/+$/, '');
}
