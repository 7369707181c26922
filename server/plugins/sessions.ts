/**
 * The browser asks nuxt-auth-utils for its session (/api/_auth/session): it is answered
 * from the server-side session row, so a session that was signed out, expired or idled out
 * reads as signed out there too, and the cookie is cleared (getSessionUser; during a page's
 * server render it reuses the page's own answer).
 */
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    const user = await getSessionUser(event)
    if (user) {
      session.user = user
      return
    }
    await clearUserSession(event)
    for (const key of Object.keys(session)) delete (session as Record<string, unknown>)[key]
  })
})
