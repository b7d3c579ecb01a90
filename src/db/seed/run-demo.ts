// Entry point of the demo seeder (run with tsx by the sequelize-cli seeder).
import { sequelize } from '@/db/sequelize';
import { seedDemo } from './demo';

const { Organisation } = await import('@/models');
if ((await Organisation.count()) > 0) {
  console.log('[seed] data already present: demo scenario not seeded');
} else {
  const t0 = Date.now();
  const summary = await seedDemo();
  console.log(`[seed] demo scenario seeded in ${((Date.now() - t0) / 1000).toFixed(1)} s: ${JSON.stringify(summary)}`);
}
await sequelize.close();
