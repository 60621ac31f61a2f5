import { sendVerification } from '../../services/account-mail'
import { createAccount } from '../../services/accounts'

export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, signUpSchema)
  const userId = await createAccount(input)
  await startSession(event, userId)
  // The account works at once; the link confirms the address (invitations and notices use it).
  const verification = await sendVerification(event, { id: userId, email: input.email, displayName: input.displayName })
  setResponseStatus(event, 201)
  return { ok: true, verificationMailed: verification.mailed }
})
