import { listComputations } from '../../../../services/computations'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  return { computations: await listComputations(companion.id) }
})
