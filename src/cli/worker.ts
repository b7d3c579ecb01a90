// The background worker `npm start` runs beside the app server: it works the
// scheduled jobs (src/lib/server/jobs). Run more than one and each job still
// fires once: pg-boss coordinates through PostgreSQL.
import { startJobQueue } from '../lib/server/jobs/queue';
import { getSettings } from '../lib/server/settings';
import { JOBS } from '../lib/server/jobs/registry';

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
