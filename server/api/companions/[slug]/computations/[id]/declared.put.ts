import { findComputation } from '../../../../../services/computations'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, computationParams)
  const input = await readBodyWith(event, declaredSchema)
  const { companion } = await requireCompanionRole(event, slug, 'author')
  await findComputation(companion.id, id)
  await useDB().update(tables.computations).set({ declared: input }).where(eq(tables.computations.id, id))
  return { ok: true }
})
