import { CreateApiTokenBody } from '../../../../shared/schemas/apiToken'
import { createApiToken } from '../../../domain/api-tokens'

/** Create an API token for one of the caller's teams (201); the answer carries the token, shown this once. */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const body = await validBody(event, CreateApiTokenBody)
  setResponseStatus(event, 201)
  return createApiToken(user.id, body)
})
