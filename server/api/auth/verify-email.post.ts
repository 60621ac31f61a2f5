import { verifyAddress } from '../../services/account-mail'

export default defineEventHandler(async (event) => {
  refuseApiToken(event)
  const { token } = await readBodyWith(event, verifyEmailSchema)
  await verifyAddress(token)
  return { ok: true }
})
