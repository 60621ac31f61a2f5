// POST /api/companions/<slug>/page/preview: the page text rendered, nothing stored.
import { pagePreviewSchema } from '#shared/page/schema'
import { previewPage } from '../../../../services/page'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { text } = await readBodyWith(event, pagePreviewSchema)
  const { companion } = await requireCompanionRole(event, slug, 'author')
  return previewPage(companion.id, text)
})
