// Entry point of the demo seeder (run with tsx by the sequelize-cli seeder).
// Seeds an empty database; redoes a seed that was interrupted half-way (its
// seed_runs row never finished); leaves a finished seed or other data alone.
import { sequelize } from '@/db/sequelize';
import { seedDemo } from './demo';
import { seedState, wipeData } from './seed-run';

const state = await seedState();
if (state === 'seeded') {
  console.log('[seed] demo scenario already seeded');
} else if (state === 'other data') {
  console.log('[seed] data already present: demo scenario not seeded');
} else {
  if (state === 'interrupted') {
    console.log('[seed] an earlier seed was interrupted half-way: emptying the tables and seeding again');
    await wipeData();
  }
  const t0 = Date.now();
  const summary = await seedDemo();
  console.log(`[seed] demo scenario seeded in ${((Date.now() - t0) / 1000).toFixed(1)} s: ${JSON.stringify(summary)}`);
}
await sequelize.close();
