import { addressStatus } from '../../services/account-mail'

export default defineEventHandler(async (event) => {
  const user = requireUser(event)
  return addressStatus(user)
})
