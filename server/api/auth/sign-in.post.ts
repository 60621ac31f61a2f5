import { checkCredentials } from '../../services/accounts'

export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, signInSchema)
  const userId = await checkCredentials(event, input)
  await startSession(event, userId)
  return { ok: true }
})
