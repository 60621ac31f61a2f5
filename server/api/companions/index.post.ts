import { createCompanion } from '../../services/companions'

export default defineEventHandler(async (event) => {
  const input = await readBodyWith(event, companionCreateSchema)
  const user = requireUser(event)
  const slug = await createCompanion(user, input)
  setResponseStatus(event, 201)
  return { slug }
})
