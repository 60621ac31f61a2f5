import { removeMember } from '../../../../services/companions'

export default defineEventHandler(async (event) => {
  const { slug, userId } = readParamsWith(event, memberParams)
  const { companion } = await requireCompanionRole(event, slug, 'editor')
  await removeMember(companion.id, userId)
  setResponseStatus(event, 204)
  return null
})
