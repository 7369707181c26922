import { SignUpBody } from '../../../../shared/schemas/auth'
import { requestSignUp } from '../../../domain/accounts'
import { throttle } from '../../../domain/throttle'

/**
 * Ask for an account and its team: 202 and a confirmation mail, the same answer whether or
 * not the address already has an account (its owner is told by mail instead). At most ten
 * sign-ups an hour per client address (429 with Retry-After).
 */
export default defineApiHandler(async (event) => {
  const body = await validBody(event, SignUpBody)
  await throttle('sign-up', clientIp(event), 10, 3600)
  await requestSignUp(body)
  setResponseStatus(event, 202)
  return { message: 'check your mail: a link to confirm the account is on its way' }
})
