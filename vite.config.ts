import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vite'
import vue from '@vitejs/plugin-vue'
import vuetify from 'vite-plugin-vuetify'
import { compression } from 'vite-plugin-compression2'
import { mdiIcons } from './tooling/vite-mdi-icons.ts'

// The client is served by the Express app in production; in development Vite proxies the API.
export default defineConfig({
  plugins: [
    vue(),
    vuetify({ autoImport: true }),
    mdiIcons({ srcDir: fileURLToPath(new URL('./src', import.meta.url)) }),
    // Brotli and gzip copies beside each text file; the server sends the one the browser accepts.
    compression({ algorithms: ['brotliCompress', 'gzip'], include: /\.(html|js|css|svg|json|wav)$/, threshold: 1024 }),
  ],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  build: { outDir: 'dist', chunkSizeWarningLimit: 1500 },
  server: {
    proxy: {
      '/api': 'http://127.0.0.1:8080',
      '/ws': { target: 'ws://127.0.0.1:8080', ws: true },
    },
  },
})
