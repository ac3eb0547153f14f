import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vite'
import vue from '@vitejs/plugin-vue'
import vuetify from 'vite-plugin-vuetify'
import { compression } from 'vite-plugin-compression2'
import { VitePWA } from 'vite-plugin-pwa'
import { mdiIcons } from './tooling/vite-mdi-icons.ts'
import { compressServiceWorker } from './tooling/vite-compress-worker.ts'
import { minimal2023Preset } from '@vite-pwa/assets-generator/config'

// The client is served by the Express app in production; in development Vite proxies the API.
export default defineConfig({
  plugins: [
    vue(),
    vuetify({ autoImport: true }),
    mdiIcons({ srcDir: fileURLToPath(new URL('./src', import.meta.url)) }),
    // Brotli and gzip copies beside each text file; the server sends the one the browser accepts.
    compression({ algorithms: ['brotliCompress', 'gzip'], include: /\.(html|js|css|svg|json|wav|webmanifest)$/, threshold: 1024 }),
    // Installable: the web manifest, icons rendered from our SVG at build, and our own service worker
    // (src/sw.ts: the precached app shell and fonts, push and notification clicks). It registers only
    // after the page has loaded (src/components/layout/UpdatePrompt.vue), so first paint never waits for it.
    VitePWA({
      strategies: 'injectManifest',
      srcDir: 'src',
      filename: 'sw.ts',
      registerType: 'prompt',
      injectRegister: false,
      manifest: {
        name: 'Tankwarden',
        short_name: 'Tankwarden',
        description: 'Round-the-clock watch, alerts and care records for aquarium businesses',
        id: '/',
        start_url: '/',
        scope: '/',
        display: 'standalone',
        theme_color: '#11606B',
        background_color: '#F3F6F6',
      },
      pwaAssets: {
        image: 'public/tankwarden-icon.svg',
        preset: { ...minimal2023Preset, maskable: { sizes: [512], padding: 0.3, resizeOptions: { background: '#11606B' } } },
        overrideManifestIcons: true,
      },
      injectManifest: {
        globPatterns: ['**/*.{js,css,html,woff2,svg,png,ico,wav}'],
        maximumFileSizeToCacheInBytes: 3 * 1024 * 1024,
      },
    }),
    compressServiceWorker({ outDir: 'dist', file: 'sw.js' }),
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
