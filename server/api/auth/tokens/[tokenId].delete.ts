import { revokeApiToken } from '../../../domain/api-tokens'

/** Revoke one of the caller's API tokens (204); it stops working at once. */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { tokenId } = await validParams(event, idParams('tokenId'))
  await revokeApiToken(user.id, tokenId)
  return sendNoContent(event, 204)
})
