import { sendVerification } from '../../services/account-mail'

export default defineEventHandler(async (event) => {
  const user = requireUser(event)
  const result = await sendVerification(event, user)
  setResponseStatus(event, result.sent ? 202 : 429)
  return result
})
