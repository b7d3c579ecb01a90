import { getViteConfig } from 'astro/config';

// One config, three projects. Unit files are pure and run in parallel; integration files run two at a time, each
// worker on its own copy of the test database (support/worker-database.ts); browser files share one database per
// lane, so a lane runs one file at a time. The runner (src/cli/test.mjs) picks the project and sets the database
// and server addresses.
const shared = { testTimeout: 30_000, hookTimeout: 120_000 };
export default getViteConfig({
  test: {
    reporters: ['default'],
    projects: [
      { extends: true, test: { ...shared, name: 'unit', include: ['tests/unit/**/*.test.ts'] } },
      {
        extends: true,
        test: { ...shared, name: 'integration', include: ['tests/integration/**/*.test.ts'], setupFiles: ['tests/integration/support/worker-database.ts'] },
      },
      { extends: true, test: { ...shared, name: 'browser', include: ['tests/browser/**/*.test.ts'] } },
    ],
  },
});
