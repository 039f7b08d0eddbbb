import path from 'node:path';
import { defineConfig } from 'vitest/config';

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '..', '..');

// Browser specs only; started by tests/e2e/run.ts, which provides the server and E2E_FIXTURES.
export default defineConfig({
  root,
  test: {
    name: 'e2e',
    include: ['tests/e2e/specs/**/*.e2e.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 60_000,
    // One browser at a time: the machine has two cores and the server is one process.
    fileParallelism: false,
  },
});
