import { accountView } from '../../services/accounts'

// Who is signed in (null when nobody is). Always answers 200.
export default defineEventHandler((event) => {
  const user = event.context.user
  return { account: user ? accountView(user) : null }
})
