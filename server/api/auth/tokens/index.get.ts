import { listApiTokens } from '../../../domain/api-tokens'

/** The caller's API tokens (never the tokens themselves), with their team, scope, expiry and last use. */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return listApiTokens(user.id)
})
