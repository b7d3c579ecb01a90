import { endpoint } from '../../lib/server/endpoint';
import { exportFilename, registerCsvStream } from '../../lib/server/register-export';
import { getSettings } from '../../lib/server/settings';
import { localDate } from '../../lib/calendar';

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
