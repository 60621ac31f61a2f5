import { revokeInvitation } from '../../../../services/invitations'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, invitationParams)
  const access = await requireCompanionRole(event, slug, 'editor')
  await revokeInvitation(access, id)
  setResponseStatus(event, 204)
  return null
})
