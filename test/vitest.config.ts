import { defineConfig } from 'vitest/config';

// Browser tests: the built app on its own seeded database, driven through Debian's Chromium.
export default defineConfig({
  test: {
    name: 'e2e',
    include: ['e2e/**/*.e2e.ts'],
    globalSetup: ['./support/global-setup.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 90_000,
    fileParallelism: false,
  },
});
