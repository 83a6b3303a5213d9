import { defineConfig } from 'vite'
import vue from '@vitejs/plugin-vue'

// The client lives in src/; the built files go to dist/client, which Express serves.
export default defineConfig({
  plugins: [vue()],
  build: {
    outDir: 'dist/client',
    emptyOutDir: true,
    chunkSizeWarningLimit: 1200,
  },
  server: {
    host: '127.0.0.1',
    proxy: { '/api': 'http://127.0.0.1:3000' },
  },
})
