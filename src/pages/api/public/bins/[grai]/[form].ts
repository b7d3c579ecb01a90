import { z } from 'zod';
import { publicEndpoint } from '@/lib/endpoint.server';
import { AppError } from '@/lib/api-errors';
import { binFromDigitalLink, receivePublicReport } from '@/lib/requests/public-reports.server';
import type { ReportForm } from '@/lib/requests/report-forms';

const FORMS = { 'collection-request': 'collection', 'damage-report': 'damage' } as const satisfies Record<string, ReportForm>;
const params = z.object({
  grai: z.string().max(300),
  form: z.enum(['collection-request', 'damage-report'], { message: 'There is no such form; use collection-request or damage-report.' }),
});

/**
 * The public bin page's two forms for scripts and other clients (multipart):
 *   POST /api/public/bins/<GRAI>/collection-request
 *   POST /api/public/bins/<GRAI>/damage-report
 * Same checks and limits as the page's own form posts (which read the form themselves, rate limits first, so the
 * route hands the request over unread); answers 201 { data: { received: true } }.
 */
export const POST = publicEndpoint({ params, status: 201 }, async ({ ctx, user, params }) => {
  const { bin, problem } = await binFromDigitalLink(params.grai);
  if (!bin) throw new AppError('not_found', problem ? `This is not a valid bin identity: ${problem}` : 'We do not know this bin.');
  const result = await receivePublicReport({ bin, request: ctx.request, clientAddress: ctx.locals.clientAddress, form: FORMS[params.form], userId: user?.id ?? null });
  if (result.ok) return { received: true };
  const details = Object.entries(result.fields).map(([path, message]) => ({ path, message }));
  throw new AppError(result.code, result.message, details.length ? details : undefined, result.retryAfter ? { 'Retry-After': String(result.retryAfter) } : undefined);
});
