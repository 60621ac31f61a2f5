import { listMembers } from '../../../../services/companions'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'editor')
  return { members: await listMembers(companion.id) }
})
