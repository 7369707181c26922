import { PasswordResetBody } from '../../../../shared/schemas/auth'
import { throttle } from '../../../domain/throttle'
import { enqueueResetRequest } from '../../../jobs/queue'

/**
 * Ask for a reset link: 202 whether or not the address has an account. Every request takes
 * the same path (a job in the queue looks the address up and mails a link when it has an
 * account), so known and unknown addresses are answered alike and as fast. At most ten
 * requests an hour per client address; per account, the job sends at most three links an hour.
 */
export default defineApiHandler(async (event) => {
  const { email } = await validBody(event, PasswordResetBody)
  await throttle('reset-request', clientIp(event), 10, 3600)
  await enqueueResetRequest(email)
  setResponseStatus(event, 202)
  return { message: 'if the address has an account, a reset link is on its way' }
})
