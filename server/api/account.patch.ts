import { updateProfile } from '../services/accounts'

export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, profileSchema)
  const user = requireUser(event)
  await updateProfile(user.id, input)
  return { ok: true }
})
