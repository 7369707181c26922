import { endSession } from '../../domain/sessions'

/** Sign out: ends the server-side session (the cookie is dead on every server at once) and clears the cookie. 204, also when already signed out. */
export default defineApiHandler(async (event) => {
  const session = await getUserSession(event)
  await endSession(session.secure?.sid)
  await clearUserSession(event)
  return sendNoContent(event, 204)
})
