import { createInvitation } from '../../../../services/invitations'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, invitationCreateSchema)
  const access = await requireCompanionRole(event, slug, 'editor')
  const result = await createInvitation(event, access, input)
  setResponseStatus(event, 201)
  return result
})
