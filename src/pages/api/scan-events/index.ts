import { endpoint, errorEnvelope } from '@/lib/endpoint.server';
import { scanRequestSchema } from '@/lib/scans/scan-schema';
import { recordScanFromClient } from '@/lib/scans/scan-intake.server';
import { dataResponse } from '@/lib/respond.server';

/**
 * Record one scan, or a batch (offline sync). Each event carries a client id:
 * a replay answers with the original result and records nothing twice.
 * A batch answers per event, so one refusal does not hold back the rest.
 */
export const POST = endpoint({ capability: 'scan.record', body: scanRequestSchema }, async ({ user, body }) => {
  if ('events' in body) {
    const results = [];
    for (const e of body.events) {
      try {
        results.push({ clientEventId: e.clientEventId, ok: true, outcome: await recordScanFromClient(user, e) });
      } catch (err) {
        results.push({ clientEventId: e.clientEventId, ok: false, ...errorEnvelope(err) });
      }
    }
    return dataResponse({ results });
  }
  const outcome = await recordScanFromClient(user, body);
  return dataResponse(outcome, outcome.replayed ? 200 : 201);
});
