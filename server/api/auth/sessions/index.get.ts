import { listSessions } from '../../../domain/sessions'

/** The caller's signed-in browsers, the current one marked. */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return listSessions(user.id, currentSessionId(event) ?? -1)
})
