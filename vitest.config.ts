import { defineConfig } from 'vitest/config';

// Server and shared tests. Client component tests run under `ng test`.
export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    environment: 'node',
    globalSetup: ['test/global-setup.ts'],
    testTimeout: 20_000,
    hookTimeout: 60_000,
    pool: 'forks',
  },
});
