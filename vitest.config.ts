import { defineConfig } from 'vitest/config';

// One project per test layer, so each layer has its own npm script (see package.json).
export default defineConfig({
  test: {
    projects: [
      { test: { name: 'unit', include: ['test/unit/**/*.test.ts'], testTimeout: 30_000 } },
      { test: { name: 'protocol', include: ['test/protocol/**/*.test.ts'], testTimeout: 60_000 } },
      { test: { name: 'cli', include: ['test/cli/**/*.test.ts'], testTimeout: 60_000 } },
      {
        test: {
          name: 'webview',
          include: ['test/webview/**/*.test.ts'],
          testTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
