import { endAllSessions } from '../../../domain/sessions'

/** Sign out everywhere: every session of the caller ends, this one too. 204. */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  await endAllSessions(user.id)
  await clearUserSession(event)
  return sendNoContent(event, 204)
})
