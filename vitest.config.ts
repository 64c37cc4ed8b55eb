import { defineConfig } from 'vitest/config';

// Engine, reference, API and CLI suites. The browser suite has its own config
// (vitest.e2e.config.ts) because it needs the built console and a real server.
export default defineConfig({
  test: {
    include: ['tests/{unit,reference,api,cli}/**/*.test.ts'],
    environment: 'node',
    pool: 'forks',
    testTimeout: 20_000,
    hookTimeout: 60_000,
  },
});
