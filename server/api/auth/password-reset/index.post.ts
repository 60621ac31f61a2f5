import { requestPasswordReset } from '../../../services/account-mail'

// Always the same answer, whether or not an account has the address.
export default defineEventHandler(async (event) => {
  refuseApiToken(event)
  const { email } = await readBodyWith(event, passwordResetRequestSchema)
  await requestPasswordReset(event, email)
  setResponseStatus(event, 202)
  return { message: 'If an account has this address, a link to choose a new password is on its way. It works for one hour.' }
})
