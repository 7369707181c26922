import { defineConfig } from 'vitest/config'

// Unit tier: the engine, schemas and pure helpers, in Node, milliseconds each.
export default defineConfig({
  test: {
    include: ['tests/unit/**/*.test.ts'],
    environment: 'node',
    setupFiles: ['tests/setup/fast-check.ts'],
  },
})
