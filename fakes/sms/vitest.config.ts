import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: { name: 'sms-fake', include: ['src/**/*.spec.ts'], environment: 'node', testTimeout: 15_000 },
});
