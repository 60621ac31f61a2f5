import { computationResult, findComputation } from '../../../../../services/computations'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, computationParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  const computation = await findComputation(companion.id, id)
  const result = await computationResult(computation.resultId)
  const comparison = computation.declared && result ? compareDeclared(computation.declared, result.table.rows) : null
  return { computation, result, comparison }
})
