import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vitest/config'
import vue from '@vitejs/plugin-vue'

const alias = {
  '@': fileURLToPath(new URL('./web/src', import.meta.url)),
  '@catalog': fileURLToPath(new URL('./catalog', import.meta.url)),
  '@contract': fileURLToPath(new URL('./contract', import.meta.url)),
}

export default defineConfig({
  plugins: [vue()],
  resolve: { alias },
  test: {
    projects: [
      { extends: true, test: { name: 'catalog', environment: 'node', include: ['tests/catalog/**/*.test.ts', 'catalog/**/*.test.ts'], testTimeout: 60_000 } },
      { extends: true, test: { name: 'api', environment: 'node', include: ['tests/api/**/*.test.ts'], setupFiles: ['tests/api/setup-database.ts'], testTimeout: 60_000 } },
      { extends: true, test: { name: 'web', environment: 'happy-dom', include: ['tests/web/**/*.test.ts', 'web/src/**/__tests__/*.test.ts'] } },
      // the several-instance arrangement: PostgreSQL, Redis, S3 fake, two API instances and two workers as processes
      { extends: true, test: { name: 'cluster', environment: 'node', include: ['tests/cluster/**/*.test.ts'], testTimeout: 120_000, hookTimeout: 240_000, fileParallelism: false } },
      // real Chromium against the built app: one file at a time, generous timeouts
      { extends: true, test: { name: 'e2e', environment: 'node', include: ['tests/e2e/**/*.test.ts'], testTimeout: 120_000, hookTimeout: 120_000, fileParallelism: false } },
    ],
  },
})
