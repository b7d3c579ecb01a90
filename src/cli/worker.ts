// The background worker `npm start` runs beside the app server: it works the
// scheduled jobs (src/lib/jobs). Run more than one and each job still
// fires once: pg-boss coordinates through PostgreSQL.
import { startJobQueue } from '../lib/jobs/queue.server';
import { getSettings } from '../lib/settings/settings.server';
import { JOBS } from '../lib/jobs/registry.server';

const url = process.env.DATABASE_URL;
if (!url) {
  console.error('[jobs] DATABASE_URL is not set');
  process.exit(1);
}
const settings = await getSettings();
const boss = await startJobQueue(url, settings.timeZone);
console.log(`[jobs] worker up: ${JOBS.map((j) => `${j.name} (${j.cron}, ${settings.timeZone})`).join('; ')}`);
for (const sig of ['SIGINT', 'SIGTERM'] as const) {
  process.on(sig, () => {
    void boss.stop({ graceful: true, timeout: 5000 }).then(() => process.exit(0));
  });
}
