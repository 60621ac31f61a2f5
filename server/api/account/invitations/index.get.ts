import { invitationsWaitingFor } from '../../../services/invitations'

export default defineEventHandler(async (event) => {
  const user = requireUser(event)
  return { invitations: await invitationsWaitingFor(user) }
})
