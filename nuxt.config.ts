// Bitslack: Nuxt 4 app. Nothing here fetches from the network at build or run time:
// fonts come from @fontsource packages, devtools and telemetry are off.
const dev = process.env.NODE_ENV !== 'production' && !process.argv.includes('build')

export default defineNuxtConfig({
  compatibilityDate: '2025-07-15',
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils', 'nuxt-security'],
  // Security headers and a content security policy the app works under (nonce-based
  // scripts). Rate limiting of sign-in, body validation and CSRF are the app's own
  // (server/middleware), so the module's generic versions are off.
  security: {
    nonce: true,
    headers: {
      contentSecurityPolicy: {
        'default-src': ["'self'"],
        'script-src': ["'self'", "'strict-dynamic'", "'nonce-{{nonce}}'"],
        'style-src': ["'self'", "'unsafe-inline'"],
        'img-src': ["'self'", 'data:', 'blob:'],
        'font-src': ["'self'", 'data:'], // Vite inlines the smallest font subsets
        'connect-src': dev ? ["'self'", 'ws:'] : ["'self'"],
        'object-src': ["'none'"],
        'base-uri': ["'none'"],
        'frame-ancestors': ["'none'"],
        'form-action': ["'self'"],
        'upgrade-insecure-requests': false,
      },
      crossOriginEmbedderPolicy: dev ? 'unsafe-none' : 'require-corp',
      strictTransportSecurity: dev ? false : { maxAge: 15552000, includeSubdomains: true },
    },
    rateLimiter: false,
    xssValidator: false,
    csrf: false,
    requestSizeLimiter: { maxRequestSizeInBytes: 2_000_000, maxUploadFileRequestInBytes: 64_000_000, throwError: true },
  },
  css: ['~/assets/css/main.css'],
  tailwindcss: { cssPath: false, viewer: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Bitslack',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Timing budgets for UART and SPI links across galvanic isolation' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  runtimeConfig: {
    databaseUrl: '',
    // the browser drops the sealed cookie after the longest a session can live; the server-side row decides earlier (server/domain/sessions.ts)
    session: { maxAge: 60 * 60 * 24 * 7 },
    public: { appVersion: process.env.npm_package_version || '0.1.0' },
  },
  nitro: {
    // Sequelize loads its dialect by name; keep pg and sequelize outside the bundle.
    externals: { external: ['pg', 'pg-hstore', 'sequelize'] },
    ...(process.env.BITSLACK_OUTPUT_DIR ? { output: { dir: process.env.BITSLACK_OUTPUT_DIR } } : {}),
  },
  typescript: { strict: true },
  // scripts/test.sh builds into its own folders so concurrent runs never share a build
  ...(process.env.BITSLACK_BUILD_DIR ? { buildDir: process.env.BITSLACK_BUILD_DIR } : {}),
})
