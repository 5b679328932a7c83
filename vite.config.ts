import { defineConfig, type Plugin } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { VitePWA } from 'vite-plugin-pwa';
import { fileURLToPath } from 'node:url';
import pkg from './package.json' with { type: 'json' };

// All PWA settings live here. registerType 'prompt': a new version is offered to the user and
// never forced mid-entry (autoUpdate would reload tabs and lose half-typed readings).
export default defineConfig({
  // Busts the persisted query cache whenever a new build ships.
  define: { __APP_VERSION__: JSON.stringify(`${pkg.version}-${Date.now()}`) },
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  plugins: [
    zodWithoutEval(),
    react(),
    tailwindcss(),
    VitePWA({
      registerType: 'prompt',
      injectRegister: null,
      includeAssets: ['icons/*.png', 'icons/icon.svg'],
      manifest: {
        name: 'Twistlog',
        short_name: 'Twistlog',
        description: 'Record flex tests in the field; derive and sign off the cab-to-body design envelope.',
        theme_color: '#10333d',
        background_color: '#f4f1e8',
        display: 'standalone',
        start_url: '/',
        icons: [
          { src: '/icons/icon-192.png', sizes: '192x192', type: 'image/png' },
          { src: '/icons/icon-512.png', sizes: '512x512', type: 'image/png' },
          { src: '/icons/icon-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        ],
      },
      workbox: {
        // The shell, every page chunk and the fonts are precached; the heavy chart chunk (lazy-*) is not.
        globPatterns: ['**/*.{js,css,html,woff,woff2,png,svg,webmanifest}'],
        globIgnores: ['**/lazy-*.js'],
        navigateFallback: '/index.html',
        navigateFallbackDenylist: [/^\/api\//, /^\/dev\//],
        runtimeCaching: [
          {
            // On-demand chunks: cached once fetched so a screen opened online also opens offline.
            urlPattern: ({ url }) => url.pathname.startsWith('/assets/lazy-'),
            handler: 'CacheFirst',
            options: { cacheName: 'twistlog-lazy-chunks', expiration: { maxEntries: 30, maxAgeSeconds: 60 * 60 * 24 * 30 } },
          },
          {
            // Photo thumbnails: shown offline after one view; they never change once stored.
            urlPattern: ({ url }) => /^\/api\/photos\/[^/]+\/thumb$/.test(url.pathname),
            handler: 'CacheFirst',
            options: { cacheName: 'twistlog-photo-thumbs', expiration: { maxEntries: 500, maxAgeSeconds: 60 * 60 * 24 * 60 } },
          },
        ],
      },
    }),
  ],
  // The keystroke worker (src/lib/db/guessed-write.worker.ts) is a module worker, precached with the pages.
  worker: { format: 'es' },
  build: {
    rollupOptions: {
      output: {
        // Only the heavy chart module is named lazy-*: it stays out of the precache (fetched and
        // runtime-cached when first opened). Every other on-demand page is precached.
        chunkFileNames: (chunk) => (chunk.name === 'desk-charts' ? 'assets/lazy-[name]-[hash].js' : 'assets/[name]-[hash].js'),
      },
    },
  },
  server: {
    proxy: { '/api': 'http://127.0.0.1:5180', '/dev': 'http://127.0.0.1:5180' },
  },
});

/**
 * zod's fast path compiles parsers with new Function(), which the app's Content-Security-Policy
 * forbids (no 'unsafe-eval', server/http/security-headers.ts); zod even probes for it when an
 * object schema is defined, and the probe alone is reported as a violation. So the client's zod is
 * jitless from the moment its core module runs, before any chunk defines a schema: a setting made
 * in main.tsx came too late once a shared chunk held schemas of its own.
 */
function zodWithoutEval(): Plugin {
  return {
    name: 'twistlog-zod-without-eval',
    transform(code, id) {
      if (!/[\\/]node_modules[\\/]zod[\\/]v4[\\/]core[\\/]core\.js$/.test(id)) return null;
      return { code: `${code}\nglobalConfig.jitless = true;\n`, map: null };
    },
  };
}
