import { z } from 'zod'
import { findFigure, overlayWithRevision } from '../../../../../services/figures'

const query = z.object({ revision: z.string().regex(/^[0-9a-f]{40}$/, 'A revision is a 40-character commit id.') })

export default defineEventHandler(async (event) => {
  const { slug, number } = readParamsWith(event, figureParams)
  const { revision } = readQueryWith(event, query)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  const figure = await findFigure(companion.id, number)
  return { spec: await overlayWithRevision(figure, revision) }
})
