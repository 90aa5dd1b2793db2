import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  // The `@/` alias of tsconfig.json (Astro and tsx read it from there).
  resolve: { alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) } },
  test: {
    include: ['tests/**/*.test.ts'],
    testTimeout: 30_000,
    hookTimeout: 120_000,
    // Two cores: keep to two workers so browser and database tests do not starve each other.
    poolOptions: { forks: { maxForks: 2, minForks: 1 } },
    pool: 'forks',
  },
});
