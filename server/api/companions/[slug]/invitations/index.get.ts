import { listInvitations } from '../../../../services/invitations'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'editor')
  return { invitations: await listInvitations(companion.id) }
})
