import { drawFigure, findFigure } from '../../../../../services/figures'

export default defineEventHandler(async (event) => {
  const { slug, number } = readParamsWith(event, figureParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  const figure = await findFigure(companion.id, number)
  return { figure, ...(await drawFigure(figure)) }
})
