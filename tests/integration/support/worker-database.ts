// Integration files run two at a time (src/cli/test.mjs), each worker on its own copy of the migrated test
// database: worker 1 keeps DATABASE_URL, worker N uses `<database>_N`, made by the runner from the first as a
// template. Runs before a file's imports, so the one Sequelize instance and any child process the file starts
// (the seeder, the job queue) see the worker's database. Every file still starts from empty tables
// (support/db.ts resetDatabase), so which worker runs it does not matter.
import { workerDatabaseUrl } from '@/cli/worker-database.mjs';

process.env.DATABASE_URL = workerDatabaseUrl(process.env.DATABASE_URL, process.env.VITEST_POOL_ID);
