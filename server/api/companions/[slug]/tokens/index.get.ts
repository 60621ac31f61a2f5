import { listTokens } from '../../../../services/tokens'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'author')
  return { tokens: await listTokens(companion.id) }
})
