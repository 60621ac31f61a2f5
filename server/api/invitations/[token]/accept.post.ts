import { acceptInvitation } from '../../../services/invitations'

export default defineEventHandler(async (event) => {
  const { token } = readParamsWith(event, invitationTokenParams)
  const user = requireUser(event)
  return acceptInvitation(user, token)
})
