import path from 'node:path';
import { defineConfig } from 'vitest/config';

const root = path.dirname(new URL(import.meta.url).pathname);
const alias = {
  '@': root,
  // The marker package throws outside React Server Components; in tests every module is server-side.
  'server-only': path.join(root, 'tests/support/server-only.ts'),
};

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts', 'tests/unit/**/*.test.tsx'], environment: 'node' },
      },
      {
        resolve: { alias },
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts', 'tests/integration/**/*.test.tsx'],
          environment: 'node',
          setupFiles: ['tests/support/integration-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          // Against a PostgreSQL server all files share one database, so they take turns.
          fileParallelism: !process.env.DATABASE_URL,
        },
      },
    ],
  },
});
