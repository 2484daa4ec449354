// Nuxt configuration. No network at build or run time: telemetry and devtools are off,
// fonts come from @fontsource packages inside the app.
import { fileURLToPath } from 'node:url'
import { SCRYPT_OPTIONS } from './server/utils/password-policy'

export default defineNuxtConfig({
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils', '@vite-pwa/nuxt'],
  devtools: { enabled: false },
  // npm test builds into a folder of its own while nuxt prepare (typecheck) writes .nuxt beside it
  ...process.env.SETLINE_BUILD_DIR ? { buildDir: process.env.SETLINE_BUILD_DIR } : {},
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Setline',
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }, { name: 'theme-color', content: '#A6452B' }],
      // the icons and manifest are made from public/icon.svg by `npm run icons` (db/local/make-icons.ts)
      link: [
        { rel: 'icon', href: '/favicon.png', type: 'image/png', sizes: '32x32' },
        { rel: 'icon', href: '/icon.svg', type: 'image/svg+xml' },
        { rel: 'apple-touch-icon', href: '/icons/apple-touch-icon.png' },
        { rel: 'manifest', href: '/manifest.webmanifest' },
      ],
    },
  },
  css: [
    '@fontsource/atkinson-hyperlegible-next/400.css',
    '@fontsource/atkinson-hyperlegible-next/600.css',
    '@fontsource/atkinson-hyperlegible-next/700.css',
    '~/assets/css/print.css',
  ],
  runtimeConfig: {
    session: {
      name: 'setline-session',
      maxAge: 60 * 60 * 12,
      // Secure is set per sign-in when APP_URL is https (server/utils/auth.ts): shop tablets
      // often reach a workshop server over plain http on the local network.
      cookie: { sameSite: 'lax', secure: false },
    },
    public: {
      // The board's resource-timeline plugin is used under its GPL key, which fits Setline's
      // GPL-3.0-or-later licence (LICENSE). A shop holding a commercial licence sets its own key
      // with NUXT_PUBLIC_SCHEDULER_LICENSE_KEY.
      schedulerLicenseKey: 'GPL-My-Project-Is-Open-Source',
    },
  },
  // Performance (figures in tests/bench/lighthouse-results.md).
  // The global stylesheet (Tailwind and the font faces, about 6 KB compressed) goes inside each
  // page's HTML instead of as a render-blocking file: on a phone's mobile data a stylesheet is one
  // more round trip before anything paints. The CSP allows inline styles (server/utils/security-headers.ts).
  features: { inlineStyles: true },
  experimental: {
    // NuxtLink fetches a linked page's code when the link is pointed at or focused, not as soon as
    // it scrolls into view: a page full of links (the lead's menu has fifteen) otherwise downloads
    // most of the app on a phone's mobile data before anyone taps anything.
    defaults: { nuxtLink: { prefetchOn: { visibility: false, interaction: true } } },
  },
  compatibilityDate: '2026-11-01',
  nitro: {
    experimental: { websocket: true },
    // every file in .output/public is also written as .br and .gz at the top levels; Nitro's
    // static handler answers the one the browser accepts, with Content-Encoding and Vary.
    // Pages and JSON are compressed per request by server/plugins/compression.ts.
    compressPublicAssets: { gzip: true, brotli: true },
    // the services tests import server code directly: typed with its auto-imports, like server/
    typescript: { tsConfig: { include: ['../tests/services/**/*', '../tests/setup/services.ts'] } },
  },
  // pre-bundled in development so the first visit does not reload the page
  vite: { optimizeDeps: { include: ['socket.io-client', 'chart.js', 'vue-chartjs'] } },
  typescript: { strict: true },
  telemetry: false,
  hooks: {
    // No rel=prefetch hints for the chunks a page might import later: Chrome fetches them at idle,
    // the same data-cost as NuxtLink's viewport prefetch; modulepreload of what the page runs stays.
    'build:manifest'(manifest) {
      for (const chunk of Object.values(manifest)) chunk.prefetch = false
    },
    // nuxt-auth-utils adds, when Nitro's websockets are on, a plugin that reads the session on
    // every request; h3 starts (and sets the cookie of) a new session for a request without
    // one, so even /api/health answered with a session cookie. The live socket unseals the
    // cookie itself (server/plugins/socket.io.ts) and routes read it through requireRole.
    // Our error handler first (database away → 503), then Nuxt's (error pages), then Nitro's.
    'nitro:config'(config) {
      const own = fileURLToPath(new URL('./server/error-handler.ts', import.meta.url))
      config.errorHandler = [own, ...[config.errorHandler ?? []].flat()]
      config.plugins = (config.plugins ?? []).filter(p => typeof p !== 'string' || !/nuxt-auth-utils[\\/].*plugins[\\/]ws(\.js)?$/.test(p))
    },
  },
  auth: { hash: { scrypt: SCRYPT_OPTIONS } },
  // The service worker (workbox through @vite-pwa/nuxt) that lets the floor and finishing
  // tablets reload without Wi-Fi. It is registered only for shop staff (app/plugins/
  // service-worker.client.ts), so clients' phones never download it. It keeps:
  // - the app's hashed scripts and styles (precached, cache first: a hashed name never changes),
  //   the icons, and fonts and other build files as they are used (cache first, bounded);
  // - the HTML of /floor and /finishing only, network first: online every reload reads the
  //   server, offline the last copy opens and the page reads its cards from the outbox's cache;
  // - no other page, no API answer, no write (only GET navigations are matched).
  // Signing out deletes the pages' copies (useSignOut). The web app manifest is public/'s own.
  pwa: {
    strategies: 'generateSW',
    registerType: 'autoUpdate',
    injectRegister: false,
    manifest: false,
    client: { registerPlugin: false },
    workbox: {
      navigateFallback: null,
      globPatterns: ['_nuxt/**/*.{js,css}', 'favicon.png', 'icon.svg', 'icons/*.png'],
      cleanupOutdatedCaches: true,
      clientsClaim: true,
      skipWaiting: true,
      runtimeCaching: [
        {
          // serialised into the worker as written: no outside names, no types inside
          urlPattern: ({ request, url }) => request.mode === 'navigate' && /^\/(floor|finishing)\/?$/.test(url.pathname),
          handler: 'NetworkFirst',
          options: {
            cacheName: 'setline-pages',
            networkTimeoutSeconds: 10,
            // a sign-in redirect or an error page is never kept as the page's offline copy
            plugins: [{ cacheWillUpdate: async ({ response }) => (response.status === 200 && !response.redirected ? response : null) }],
          },
        },
        {
          urlPattern: ({ url }) => url.pathname.startsWith('/_nuxt/'),
          handler: 'CacheFirst',
          options: { cacheName: 'setline-assets', expiration: { maxEntries: 200, maxAgeSeconds: 60 * 60 * 24 * 30 }, cacheableResponse: { statuses: [200] } },
        },
      ],
    },
  },
  tailwindcss: { cssPath: '~/assets/css/tailwind.css', viewer: false },
})
