import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Tests run on the TypeScript sources: each workspace package resolves to its src/index.ts,
// so `npm test` needs no build step (the CLI end-to-end tests build on demand).
const src = (p: string) => fileURLToPath(new URL(p, import.meta.url));

export default defineConfig({
  resolve: {
    alias: {
      '@kinespec/signal': src('./packages/signal/src/index.ts'),
      '@kinespec/kinematics': src('./packages/kinematics/src/index.ts'),
      '@kinespec/signatures': src('./packages/signatures/src/index.ts'),
      '@kinespec/simulator': src('./packages/simulator/src/index.ts'),
      '@kinespec/diagnosis': src('./packages/diagnosis/src/index.ts'),
      '@kinespec/forecast': src('./packages/forecast/src/index.ts'),
      '@kinespec/api': src('./services/api/src/index.ts'),
    },
  },
  test: {
    include: ['packages/*/src/**/*.test.ts', 'services/*/src/**/*.test.ts', 'tests/**/*.test.ts'],
    exclude: ['**/node_modules/**', '**/dist/**'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
    setupFiles: ['tests/fast-check-setup.ts'],
  },
});
