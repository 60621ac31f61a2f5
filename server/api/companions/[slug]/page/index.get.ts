// GET /api/companions/<slug>/page: the page text, its rendered blocks and what they name.
import { pageView } from '../../../../services/page'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  return pageView(companion)
})
