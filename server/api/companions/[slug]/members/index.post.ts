import { addMember } from '../../../../services/companions'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, memberAddSchema)
  const { companion } = await requireCompanionRole(event, slug, 'editor')
  const member = await addMember(companion.id, input.email, input.role)
  setResponseStatus(event, 201)
  return { member }
})
