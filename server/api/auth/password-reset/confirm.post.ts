import { resetPassword } from '../../../services/account-mail'

export default defineEventHandler(async (event) => {
  refuseApiToken(event)
  const { token, password } = await readBodyWith(event, passwordResetSchema)
  const userId = await resetPassword(token, password)
  await startSession(event, userId)
  return { ok: true }
})
