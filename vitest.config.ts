import { defineConfig } from 'vitest/config';

// One run, one summary: every workspace's tests plus the browser tests under test/.
export default defineConfig({
  test: { projects: ['shared', 'server', 'client', 'test', 'fakes/sms'] },
});
