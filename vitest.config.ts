import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

// Unit tier: the engine, schemas and pure helpers, in Node, milliseconds each.
export default defineConfig({
  // Nuxt's alias for the shared folder, so app utilities resolve as in the app
  resolve: { alias: { '#shared': fileURLToPath(new URL('./shared', import.meta.url)) } },
  test: {
    include: ['tests/unit/**/*.test.ts'],
    environment: 'node',
    setupFiles: ['tests/setup/fast-check.ts'],
  },
})
