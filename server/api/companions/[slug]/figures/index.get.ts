import { drawFigure, listFigures } from '../../../../services/figures'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  const figures = await listFigures(companion.id)
  const withStatus = await Promise.all(figures.map(async f => ({ ...f, status: (await drawFigure(f)).status })))
  return { figures: withStatus }
})
