import type { APIRoute } from 'astro';
import { findBin } from '@/lib/bins/bin-lookup.server';

/**
 * The "find a bin" box posts here (GET ?q=…): a GRAI in any form or a serial
 * opens the bin page; anything else comes back with the reason.
 */
export const GET: APIRoute = async ({ url, locals, redirect }) => {
  const q = url.searchParams.get('q') ?? '';
  const result = await findBin(q, locals.user!);
  if (result.kind === 'found') return redirect(`/bins/${encodeURIComponent(result.grai)}`, 303);
  const back = new URLSearchParams({ q });
  if (result.kind === 'many') back.set('many', result.matches.map((m) => m.grai).join(','));
  else back.set('problem', result.message);
  return redirect(`/bins/search?${back}`, 303);
};
