import { readFileSync } from 'node:fs';
import { defineConfig } from 'vitest/config';

const pkg = JSON.parse(readFileSync(new URL('./package.json', import.meta.url), 'utf8')) as { version: string };

export default defineConfig({
  define: { LAYLINE_VERSION: JSON.stringify(pkg.version) },
  oxc: { jsx: { runtime: 'automatic', importSource: 'preact' } },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
          exclude: ['test/e2e/**', 'node_modules/**'],
          testTimeout: 30_000,
        },
      },
      // The time and itinerary tests again under three machine zones: DST handling must not depend on the process TZ.
      ...(
        [
          ['tz-utc', 'UTC'],
          ['tz-new-york', 'America/New_York'],
          ['tz-sydney', 'Australia/Sydney'],
        ] as const
      ).map(([name, tz]) => ({
        extends: true as const,
        test: {
          name,
          include: ['test/shared/time/**/*.test.ts', 'test/shared/itinerary/**/*.test.ts'],
          // The airport table and the fuzz test do not depend on the machine zone; once, in `unit`, is enough.
          exclude: ['test/shared/time/airports.test.ts', 'test/shared/itinerary/parse-trips-fuzz.test.ts'],
          env: { TZ: tz },
          testTimeout: 30_000,
        },
      })),
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.test.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
