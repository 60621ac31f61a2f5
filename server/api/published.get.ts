// GET /api/published?q=&page=: published companions, public, searchable, twenty a page.
import { publishedQuerySchema } from '#shared/utils/citation'
import { listPublished } from '../services/published'

export default defineEventHandler(async (event) => {
  const { q, page } = readQueryWith(event, publishedQuerySchema)
  return listPublished(q, page)
})
