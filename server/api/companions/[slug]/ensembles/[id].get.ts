import { ensembleConfigurations, findEnsemble } from '../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, ensembleParams)
  const { companion, role } = await requireCompanionRole(event, slug, 'reader', { tokenScope: 'ensembles:read' })
  const ensemble = await findEnsemble(companion.id, id)
  const configurations = await ensembleConfigurations(id)
  return { ensemble, configurations, role }
})
