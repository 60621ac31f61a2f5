import { createFigure } from '../../../../services/figures'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, figureCreateSchema)
  const { companion, user } = await requireCompanionRole(event, slug, 'author')
  setResponseStatus(event, 201)
  return createFigure(companion, user!, input)
})
