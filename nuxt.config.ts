// Bitslack: Nuxt 4 app. Nothing here fetches from the network at build or run time:
// fonts come from @fontsource packages, devtools and telemetry are off.
export default defineNuxtConfig({
  compatibilityDate: '2025-07-15',
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils'],
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
