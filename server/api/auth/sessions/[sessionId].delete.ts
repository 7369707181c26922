import { endSessionById } from '../../../domain/sessions'

/** End one of the caller's own sessions (another browser); ending the current one also clears its cookie. 204. */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { sessionId } = await validParams(event, idParams('sessionId'))
  await endSessionById(user.id, sessionId)
  if (sessionId === currentSessionId(event)) await clearUserSession(event)
  return sendNoContent(event, 204)
})
