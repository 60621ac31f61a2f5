import { createComputation } from '../../../../services/computations'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, computationCreateSchema)
  const { companion, user } = await requireCompanionRole(event, slug, 'author')
  setResponseStatus(event, 201)
  return createComputation(companion, user!, { ...input, parameters: Object.fromEntries(Object.entries(input.parameters).filter(([, v]) => v !== null)) })
})
