import { updateEnsemble } from '../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, ensembleParams)
  const patch = await readBodyWith(event, ensembleUpdateSchema)
  const { companion, user } = await requireCompanionRole(event, slug, 'author', { tokenScope: 'ensembles:write' })
  const { revision } = await updateEnsemble(companion, user!, id, patch)
  return { revision }
})
