/**
 * The browser asks nuxt-auth-utils for its session (/api/_auth/session): it is answered
 * from the server-side session row, so a session that was signed out, expired or idled out
 * reads as signed out there too, and the cookie is cleared.
 */
import { resolveSession } from '../domain/sessions'

export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    const resolved = await resolveSession(session.secure?.sid)
    if (resolved) {
      session.user = resolved.user
      return
    }
    await clearUserSession(event)
    for (const key of Object.keys(session)) delete (session as Record<string, unknown>)[key]
  })
})
