// GET /api/companions/<slug>/citation: the licence, the engine version and every citation of the
// companion and its datasets, in BibTeX and CSL-JSON (for the cite page and its aside panel).
import { citationSheet } from '../../../services/citations'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const access = await requireCompanionRole(event, slug, 'reader')
  return citationSheet(event, access)
})
