import { createAccount } from '../../services/accounts'

export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, signUpSchema)
  const userId = await createAccount(input)
  await startSession(event, userId)
  setResponseStatus(event, 201)
  return { ok: true }
})
