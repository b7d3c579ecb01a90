import { endpoint } from '@/lib/endpoint.server';
import { exportFilename, registerCsvStream } from '@/lib/bins/register-export.server';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate } from '@/lib/calendar';

/** The whole bin register as CSV, streamed page by page (planner and admin). */
export const GET = endpoint({ capability: 'bins.import' }, async () => {
  const { timeZone } = await getSettings();
  return new Response(registerCsvStream(), {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${exportFilename(localDate(new Date(), timeZone))}"`,
      'Cache-Control': 'no-store',
    },
  });
});
