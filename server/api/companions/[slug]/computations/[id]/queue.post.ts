import { requeueComputation } from '../../../../../services/computations'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, computationParams)
  const { companion } = await requireCompanionRole(event, slug, 'author')
  await requeueComputation(companion.id, id)
  return { ok: true }
})
