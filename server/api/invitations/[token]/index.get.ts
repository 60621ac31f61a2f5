import { describeInvitation } from '../../../services/invitations'

// Whoever holds the link may see what it invites to (the link is the secret).
export default defineEventHandler(async (event) => {
  refuseApiToken(event)
  const { token } = readParamsWith(event, invitationTokenParams)
  return describeInvitation(token, event.context.user ?? null)
})
