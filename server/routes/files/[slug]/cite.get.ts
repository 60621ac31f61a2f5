// GET /files/<slug>/cite?format=bibtex|csl-json[&ensemble=<id>]: the citation of the companion
// (or of one of its datasets) as a file to save.
import { bibtexEntry, citationFileName, citeQuerySchema, cslJson } from '#shared/utils/citation'
import { citationInput } from '../../../services/citations'

const types = { 'bibtex': 'application/x-bibtex; charset=utf-8', 'csl-json': 'application/vnd.citationstyles.csl+json; charset=utf-8' } as const

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { format, ensemble } = readQueryWith(event, citeQuerySchema)
  const { companion } = await requireCompanionRole(event, slug, 'reader', { tokenScope: 'ensembles:read' })
  const input = await citationInput(event, companion, ensemble)
  setResponseHeaders(event, {
    'Content-Type': types[format],
    'Content-Disposition': `attachment; filename="${citationFileName(input, format)}"`,
  })
  return format === 'bibtex' ? bibtexEntry(input) : cslJson(input)
})
