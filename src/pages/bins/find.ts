import { z } from 'zod';
import { endpoint } from '@/lib/endpoint.server';
import { findBin } from '@/lib/bins/bin-lookup.server';

// Whatever was typed is handed to findBin(), which explains what it cannot read; only the length is bounded here.
const query = z.object({ q: z.string().max(2_000).catch('') });

/**
 * The "find a bin" box posts here (GET ?q=…): a GRAI in any form or a serial
 * opens the bin page; anything else comes back to the search page with the reason.
 */
export const GET = endpoint({ capability: 'bins.view', query }, async ({ ctx, user, query }) => {
  const result = await findBin(query.q, user);
  if (result.kind === 'found') return ctx.redirect(`/bins/${encodeURIComponent(result.grai)}`, 303);
  const back = new URLSearchParams({ q: query.q });
  if (result.kind === 'many') back.set('many', result.matches.map((m) => m.grai).join(','));
  else back.set('problem', result.message);
  return ctx.redirect(`/bins/search?${back}`, 303);
});
