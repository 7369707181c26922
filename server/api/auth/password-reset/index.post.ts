import { PasswordResetBody } from '../../../../shared/schemas/auth'
import { requestPasswordReset } from '../../../domain/accounts'

/**
 * Ask for a reset link: 202 whether or not the address has an account (the answer
 * reveals nothing). The mail leaves after the answer, so an existing address is not
 * slower to answer than an unknown one; a failed send is logged by sendMail.
 */
export default defineApiHandler(async (event) => {
  const { email } = await validBody(event, PasswordResetBody)
  const send = await requestPasswordReset(email)
  if (send) void send().catch(() => {})
  setResponseStatus(event, 202)
  return { message: 'if the address has an account, a reset link is on its way' }
})
