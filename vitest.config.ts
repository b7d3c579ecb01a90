import { getViteConfig } from 'astro/config';

// One config, three folders. The runner (src/cli/test.mjs) picks the folder and
// sets the database and server addresses; database files run one at a time.
export default getViteConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    fileParallelism: false,
    testTimeout: 30_000,
    hookTimeout: 120_000,
    reporters: ['default'],
  },
});
