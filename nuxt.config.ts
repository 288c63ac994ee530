// Setwell's Nuxt configuration. Everything runs on this machine: no telemetry, no font or CDN hosts.
export default defineNuxtConfig({
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils', '@nuxt/eslint', '@vite-pwa/nuxt'],
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en-GB' },
      title: 'Setwell',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1, viewport-fit=cover' },
        { name: 'theme-color', content: '#26313B' },
        // opened from the home screen, full screen like the installed app it is
        { name: 'mobile-web-app-capable', content: 'yes' },
        { name: 'apple-mobile-web-app-title', content: 'Setwell' },
        { name: 'description', content: 'Setwell: the back office for small plastering firms.' },
      ],
      link: [
        { rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' },
        { rel: 'apple-touch-icon', href: '/icons/apple-touch-180.png' },
        { rel: 'manifest', href: '/manifest.webmanifest' },
      ],
    },
  },
  css: ['~/assets/css/main.css'],
  runtimeConfig: {
    // Each of these is overridden at run time by NUXT_<NAME> (for example NUXT_DATABASE_URL).
    databaseUrl: '',
    databasePoolMax: 10,
    appUrl: 'http://127.0.0.1:3000',
    mailFrom: 'Setwell <no-reply@setwell.invalid>',
    smtpHost: '127.0.0.1',
    smtpPort: 1025,
    smtpSecure: false,
    smtpUser: '',
    smtpPass: '',
    /** Wrong passwords one address may send in 15 minutes, across accounts (server/utils/limits.ts). */
    signInAddressMax: 30,
    /** Read the client's address from X-Forwarded-For: only behind a proxy you run that sets it. */
    trustProxy: false,
    /** Largest photo accepted (bytes): 413 beyond it. */
    uploadMaxBytes: 15 * 1024 * 1024,
    /** Card payments. Locally the Stripe fake (scripts/lib/stripe-fake.mjs) at stripeApiBase; live: real keys and stripeApiBase empty. */
    /** Background jobs (pg-boss): payment reminders. NUXT_JOBS_ENABLED=false turns them off. */
    jobsEnabled: true,
    /** How often the reminder sweep runs (cron, in the server's time zone). */
    remindersCron: '*/15 * * * *',
    stripeSecretKey: 'sk_test_setwell_local',
    stripeWebhookSecret: 'whsec_setwell_local',
    stripeApiBase: 'http://127.0.0.1:12111',
    session: {
      name: 'setwell-session',
      maxAge: 60 * 60 * 24 * 14,
      cookie: { sameSite: 'lax' },
    },
  },
  routeRules: {
    // the build's scripts and styles carry their content's hash in their names: a phone keeps them
    // a year and never asks again (a new build has new names). Pages (no cache-control: the server
    // draws them afresh each time), the service worker and the manifest are never kept long.
    '/_nuxt/**': { headers: { 'cache-control': 'public, max-age=31536000, immutable' } },
    '/sw.js': { headers: { 'cache-control': 'no-cache' } },
    '/manifest.webmanifest': { headers: { 'cache-control': 'no-cache' } },
    // the app shell a phone with no signal is given for any page (app/service-worker/sw.ts): the
    // app with no server-side data, which draws the page from what the phone kept
    '/app-shell': { ssr: false, headers: { 'cache-control': 'no-store' } },
    // the section once called the price book is Rates and rules now: old bookmarks land there
    '/price-book': { redirect: { to: '/rates', statusCode: 301 } },
  },
  experimental: {
    // links fetch their page's code when touched or hovered, not whenever they scroll into view: on
    // a phone the menu alone would otherwise pull in every linked page's script (npm run bench)
    defaults: { nuxtLink: { prefetchOn: { visibility: false, interaction: true } } },
    // no route rules live on the client, so the build manifest Nuxt would fetch for them is not
    // needed: without it a phone that loses its signal mid-visit logs no failed fetch either
    appManifest: false,
  },
  compatibilityDate: '2026-07-01',
  telemetry: false,
  // Installable and usable with no signal (DEVELOPERS.md "Offline"). injectManifest: the service
  // worker is our own file (app/service-worker/sw.ts) built with Workbox's parts.
  pwa: {
    strategies: 'injectManifest',
    srcDir: 'service-worker',
    filename: 'sw.ts',
    registerType: 'autoUpdate',
    injectRegister: false,
    manifest: {
      name: 'Setwell',
      short_name: 'Setwell',
      description: 'The back office for small plastering firms.',
      lang: 'en-GB',
      start_url: '/',
      scope: '/',
      display: 'standalone',
      orientation: 'portrait',
      theme_color: '#26313B',
      background_color: '#FBF3F0',
      icons: [
        { src: '/icons/icon-192.png', sizes: '192x192', type: 'image/png' },
        { src: '/icons/icon-512.png', sizes: '512x512', type: 'image/png' },
        { src: '/icons/maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        { src: '/favicon.svg', sizes: 'any', type: 'image/svg+xml' },
      ],
    },
    injectManifest: {
      // the app's code, styles, fonts and icons; not the photos or documents (they are data)
      globPatterns: ['_nuxt/**/*.{js,css,woff2}', 'icons/*.png', 'favicon.svg'],
      maximumFileSizeToCacheInBytes: 3 * 1024 * 1024,
    },
    // registered by app/plugins/offline.client.ts once someone signs in: a customer opening a
    // quote link never gets the firm's app on their phone
    client: { installPrompt: false, registerPlugin: false },
    devOptions: { enabled: false },
  },
  tailwindcss: {
    // our own file holds the @tailwind directives; without cssPath the base styles ship twice
    cssPath: '~/assets/css/main.css',
    viewer: false,
  },
  // SETWELL_OUTPUT_DIR lets two builds live side by side (a second checkout of the tests); normally .output
  // (its own build folder and its own Vite cache, so two builds at once do not share files)
  ...(process.env.SETWELL_OUTPUT_DIR ? { buildDir: `${process.env.SETWELL_OUTPUT_DIR}-nuxt`, vite: { cacheDir: `${process.env.SETWELL_OUTPUT_DIR}-vite` } } : {}),
  nitro: {
    // the public files (scripts, styles, fonts, the service worker) are also written as .br and .gz
    // at build; the server sends the one the browser takes (Accept-Encoding). Pages and API answers
    // are compressed as they go out (server/middleware/00.compression.ts).
    compressPublicAssets: { gzip: true, brotli: true },
    // Node 20 runs ES2022; the default es2019 target warns on the BigInt literals in shared/utils
    esbuild: { options: { target: 'es2022' } },
    output: process.env.SETWELL_OUTPUT_DIR ? { dir: process.env.SETWELL_OUTPUT_DIR } : undefined,
  },
  typescript: {
    strict: true,
  },
  hooks: {
    // `nuxt dev --host 127.0.0.1` still opens Vite's HMR socket on every interface
    'vite:extendConfig'(config) {
      const server = config.server as { hmr?: boolean | Record<string, unknown> } | undefined
      if (server && typeof server.hmr !== 'boolean') server.hmr = { ...(server.hmr ?? {}), host: '127.0.0.1' }
    },
  },
  eslint: {
    config: { stylistic: true },
  },
})
