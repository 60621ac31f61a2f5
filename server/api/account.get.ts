import { accountView } from '../services/accounts'

export default defineEventHandler((event) => {
  const user = requireUser(event)
  return { account: accountView(user) }
})
