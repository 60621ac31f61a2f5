import { accountView, remarkMailOf } from '../services/accounts'

export default defineEventHandler(async (event) => {
  const user = requireUser(event)
  return { account: { ...accountView(user), remarkMail: await remarkMailOf(user.id) } }
})
