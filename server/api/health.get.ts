/** Liveness and database status; public (no session needed). */
export default defineEventHandler(async (event) => {
  const database = (await databaseAnswers()) ? 'up' : 'down'
  if (database === 'down') setResponseStatus(event, 503)
  return {
    name: 'Bitslack',
    version: useRuntimeConfig().public.appVersion,
    database,
  }
})
