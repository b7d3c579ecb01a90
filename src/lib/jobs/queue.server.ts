import PgBoss from 'pg-boss';
import { JOBS } from './registry.server';

/**
 * Starts pg-boss on the app database (its own schema, "pgboss"), creates one
 * queue per job, schedules each in the operator's time zone and works it.
 * pg-boss's scheduler fires a cron once across every process that runs this.
 */
export async function startJobQueue(databaseUrl: string, timeZone: string, log: (msg: string) => void = console.log): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString: databaseUrl, max: 4, application_name: 'loopfold-jobs' });
  boss.on('error', (err) => log(`[jobs] ${err.message}`));
  await boss.start();
  for (const job of JOBS) {
    await boss.createQueue(job.name);
    await boss.schedule(job.name, job.cron, {}, { tz: timeZone });
    await boss.work(job.name, async () => {
      const t0 = Date.now();
      const result = await job.run({ now: new Date() });
      log(`[jobs] ${job.name} done in ${Date.now() - t0} ms: ${JSON.stringify(result)}`);
      return result;
    });
  }
  return boss;
}
