import { PasswordResetCompleteBody } from '../../../../shared/schemas/auth'
import { completePasswordReset } from '../../../domain/accounts'

/** Set a new password with the mailed token (single use, expiring). 204; 400 naming `token` when it is no good. */
export default defineApiHandler(async (event) => {
  const { token, password } = await validBody(event, PasswordResetCompleteBody)
  await completePasswordReset(token, password)
  return sendNoContent(event, 204)
})
