import { endpoint } from '@/lib/endpoint.server';
import { exportFilename, registerCsvStream } from '@/lib/bins/register-export.server';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate } from '@/lib/calendar';
import { csvResponse } from '@/lib/http/csv-response';

/** The whole bin register as CSV, streamed page by page (planner and admin). */
export const GET = endpoint({ capability: 'bins.import' }, async () => {
  const { timeZone } = await getSettings();
  return csvResponse(registerCsvStream(), exportFilename(localDate(new Date(), timeZone)));
});
