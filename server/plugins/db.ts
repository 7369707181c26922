/**
 * Connect to PostgreSQL at boot and fail fast: a server that cannot reach its
 * database must not start serving. Migrations are applied before start (scripts/db.ts).
 */
export default defineNitroPlugin(async (nitroApp) => {
  const db = useDb()
  try {
    await db.authenticate()
  } catch (err) {
    console.error('[bitslack] database unreachable at start:', err instanceof Error ? err.message : err)
    process.exit(1)
  }
  nitroApp.hooks.hook('close', async () => {
    await db.close()
  })
})
