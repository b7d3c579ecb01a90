import type { APIRoute } from 'astro';
import { binFromDigitalLink, receivePublicReport } from '@/lib/requests/public-reports.server';
import { dataResponse, errorResponse } from '@/lib/respond.server';
import { toErrorResponse } from '@/lib/endpoint.server';
import type { ReportForm } from '@/lib/requests/report-forms';

const FORMS: Record<string, ReportForm> = { 'collection-request': 'collection', 'damage-report': 'damage' };

/**
 * The public bin page's two forms for scripts and other clients (multipart):
 *   POST /api/public/bins/<GRAI>/collection-request
 *   POST /api/public/bins/<GRAI>/damage-report
 * Same checks and limits as the page's own form posts; answers 201 { data: { received: true } }.
 */
export const POST: APIRoute = async ({ params, request, locals }) => {
  try {
    const form = FORMS[params.form ?? ''];
    if (!form) return errorResponse('not_found', 'There is no such form; use collection-request or damage-report.');
    const { bin, problem } = await binFromDigitalLink(params.grai ?? '');
    if (!bin) return errorResponse('not_found', problem ? `This is not a valid bin identity: ${problem}` : 'We do not know this bin.');
    const result = await receivePublicReport({ bin, request, clientAddress: locals.clientAddress, form, userId: locals.user?.id ?? null });
    if (result.ok) return dataResponse({ received: true }, 201);
    const details = Object.entries(result.fields).map(([path, message]) => ({ path, message }));
    const headers: Record<string, string> = result.retryAfter ? { 'Retry-After': String(result.retryAfter) } : {};
    return errorResponse(result.code, result.message, details.length ? details : undefined, headers);
  } catch (err) {
    return toErrorResponse(err);
  }
};
