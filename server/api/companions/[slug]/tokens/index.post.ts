import { createToken } from '../../../../services/tokens'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, tokenCreateSchema)
  const { companion, user } = await requireCompanionRole(event, slug, 'author')
  setResponseStatus(event, 201)
  return { token: await createToken(companion.id, user!, input.name, input.scopes) }
})
