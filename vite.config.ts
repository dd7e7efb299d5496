import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vite'
import vue from '@vitejs/plugin-vue'

const apiPort = process.env.PORT ?? '3000'

export default defineConfig({
  root: fileURLToPath(new URL('./web', import.meta.url)),
  plugins: [vue()],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./web/src', import.meta.url)),
      '@catalog': fileURLToPath(new URL('./catalog', import.meta.url)),
      '@contract': fileURLToPath(new URL('./contract', import.meta.url)),
    },
  },
  // module workers: the bistable table (table-data.json) stays its own chunk, fetched on first use
  worker: { format: 'es' },
  build: {
    outDir: fileURLToPath(new URL('./dist/web', import.meta.url)),
    emptyOutDir: true,
    chunkSizeWarningLimit: 900,
  },
  server: {
    proxy: { '/api': `http://127.0.0.1:${apiPort}` },
  },
})
