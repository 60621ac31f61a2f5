import { revokeToken } from '../../../../services/tokens'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, tokenParams)
  const { companion, user, role } = await requireCompanionRole(event, slug, 'author')
  await revokeToken(companion.id, user!, role, id)
  setResponseStatus(event, 204)
  return null
})
