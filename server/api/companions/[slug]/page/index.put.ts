// PUT /api/companions/<slug>/page: stores the page text as a new revision (page.md).
import { pageSaveSchema } from '#shared/page/schema'
import { savePage } from '../../../../services/page'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { text, message, basedOn } = await readBodyWith(event, pageSaveSchema)
  const { companion, user } = await requireCompanionRole(event, slug, 'author')
  return savePage(companion, user!, text, message, basedOn)
})
