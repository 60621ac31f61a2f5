import { removeEnsemble } from '../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, ensembleParams)
  const { companion, user } = await requireCompanionRole(event, slug, 'author', { tokenScope: 'ensembles:write' })
  const { revision } = await removeEnsemble(companion, user!, id)
  return { revision }
})
